import type { Metadata } from 'next';
import { notFound } from 'next/navigation';
import { MailboxView } from '@/components/mail/mailbox-view';
import { mailboxDir } from '@/lib/server/mail/mailbox';

export const metadata: Metadata = { title: 'Mailbox' };
// Read the setting on every request: switching SMTP_URL must not need a rebuild.
export const dynamic = 'force-dynamic';

/** Only while the local test mail server is in use; with a real SMTP server the page does not exist. */
export default function MailboxPage() {
  if (!mailboxDir()) notFound();
  return <MailboxView />;
}
