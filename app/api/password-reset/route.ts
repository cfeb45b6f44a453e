import { NextResponse } from 'next/server';
import { route } from '@/lib/server/http/handler';
import { readJson } from '@/lib/server/http/read-json';
import { RESET_REQUEST_ANSWER, requestPasswordReset } from '@/lib/server/services/password-reset';
import { passwordResetRequestSchema } from '@/lib/shared/validations/team';

/**
 * Asks for a reset link. The answer is the same, and as quick, whether or not the address has an
 * account: the lookup and the mail run after the reply (not awaited here on purpose).
 */
export const POST = route(async (request) => {
  const { email } = await readJson(request, passwordResetRequestSchema);
  requestPasswordReset(email);
  return NextResponse.json({ message: RESET_REQUEST_ANSWER }, { status: 202 });
});
