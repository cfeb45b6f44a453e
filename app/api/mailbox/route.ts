import { NextResponse } from 'next/server';
import { route } from '@/lib/server/http/handler';
import { requireUser } from '@/lib/server/auth/session';
import { listMailbox, mailboxDir } from '@/lib/server/mail/mailbox';

/**
 * Messages the local test mail server kept that were addressed to the signed-in user, newest
 * first: everyone sees only their own mail (reset and confirmation links included). With a real
 * SMTP server configured the mailbox is off and the list is empty (`enabled: false`).
 */
export const GET = route(async (request) => {
  const user = await requireUser(request);
  const dir = mailboxDir();
  const messages = dir ? await listMailbox(dir, { recipient: user.email }) : [];
  return NextResponse.json({ enabled: dir !== null, address: user.email, messages }, { headers: { 'Cache-Control': 'no-store' } });
});
