import { NextResponse } from 'next/server';
import { route } from '@/lib/server/http/handler';
import { readJson } from '@/lib/server/http/read-json';
import { confirmAddress } from '@/lib/server/services/email-confirmation';
import { addressConfirmationSchema } from '@/lib/shared/validations/team';

/** Confirms an account's address with the token from its confirmation link (once). Public: the token is the proof. */
export const POST = route(async (request) => {
  const { token } = await readJson(request, addressConfirmationSchema);
  const { email } = await confirmAddress(token);
  return NextResponse.json({ message: `${email} is confirmed.` });
});
