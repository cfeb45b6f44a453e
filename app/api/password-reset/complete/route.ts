import { NextResponse } from 'next/server';
import { route } from '@/lib/server/http/handler';
import { readJson } from '@/lib/server/http/read-json';
import { completePasswordReset } from '@/lib/server/services/password-reset';
import { passwordResetSchema } from '@/lib/shared/validations/team';

/** Sets a new password with the token from a reset link (once). */
export const POST = route(async (request) => {
  const input = await readJson(request, passwordResetSchema);
  await completePasswordReset(input);
  return NextResponse.json({ message: 'Your password has been changed. Sign in with the new one.' });
});
