import { NextResponse } from 'next/server';
import { route } from '@/lib/server/http/handler';
import { readJson } from '@/lib/server/http/read-json';
import { clientAddress } from '@/lib/server/auth/client-address';
import { requireUser } from '@/lib/server/auth/session';
import { changePassword } from '@/lib/server/services/users';
import { passwordChangeSchema } from '@/lib/shared/validations/user';

/** Changes the signed-in user's password; every session ends, so the reply asks to sign in again. */
export const PUT = route(async (request) => {
  const user = await requireUser(request);
  const input = await readJson(request, passwordChangeSchema);
  await changePassword(user, input, clientAddress(request.headers));
  return NextResponse.json({ message: 'Your password has been changed, and every session has ended. Sign in with the new password.' });
});
