import { NextResponse } from 'next/server';
import { route } from '@/lib/server/http/handler';
import { readJson } from '@/lib/server/http/read-json';
import { RESET_REQUEST_ANSWER, requestPasswordReset } from '@/lib/server/services/password-reset';
import { passwordResetRequestSchema } from '@/lib/shared/validations/team';

/** Asks for a reset link. The answer is the same whether or not the address has an account. */
export const POST = route(async (request) => {
  const { email } = await readJson(request, passwordResetRequestSchema);
  await requestPasswordReset(email);
  return NextResponse.json({ message: RESET_REQUEST_ANSWER }, { status: 202 });
});
