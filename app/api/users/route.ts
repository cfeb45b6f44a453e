import { NextResponse } from 'next/server';
import { route } from '@/lib/server/http/handler';
import { readJson } from '@/lib/server/http/read-json';
import { clientAddress } from '@/lib/server/auth/client-address';
import { signUpSchema } from '@/lib/shared/validations/user';
import { SIGN_UP_ANSWER, signUp } from '@/lib/server/services/users';

/**
 * Sign-up. The answer is the same whether or not the address already had an account (the client
 * then tries to sign in with what was typed); a confirmation link or a notice goes out by mail.
 */
export const POST = route(async (request) => {
  const input = await readJson(request, signUpSchema);
  await signUp(input, clientAddress(request.headers));
  return NextResponse.json({ message: SIGN_UP_ANSWER }, { status: 202 });
});
