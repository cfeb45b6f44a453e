import { NextResponse } from 'next/server';
import { route } from '@/lib/server/http/handler';
import { requireUser } from '@/lib/server/auth/session';
import { resendAddressConfirmation } from '@/lib/server/services/email-confirmation';

/** Mails the signed-in user a new confirmation link for their address (the older ones stop working). */
export const POST = route(async (request) => {
  const user = await requireUser(request);
  await resendAddressConfirmation(user);
  return NextResponse.json({ message: `A new confirmation link is on its way to ${user.email}.` }, { status: 202 });
});
