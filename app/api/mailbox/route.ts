import { NextResponse } from 'next/server';
import { route } from '@/lib/server/http/handler';
import { requireUser } from '@/lib/server/auth/session';
import { listMailbox, mailboxDir } from '@/lib/server/mail/mailbox';

/**
 * Messages kept by the local test mail server, newest first. With a real SMTP server configured
 * the mailbox is off and the list is empty (`enabled: false`).
 */
export const GET = route(async (request) => {
  await requireUser(request);
  const dir = mailboxDir();
  return NextResponse.json({ enabled: dir !== null, messages: dir ? await listMailbox(dir) : [] }, { headers: { 'Cache-Control': 'no-store' } });
});
