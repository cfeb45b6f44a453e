import Link from 'next/link';
import { mailboxDir } from '@/lib/server/mail/mailbox';

/** Header links to the account settings and, while the local test mail server is in use, the mailbox. */
export function WorkspaceLinks() {
  return (
    <>
      {mailboxDir() ? (
        <Link href="/mailbox" className="text-ink-soft hover:text-ink" data-testid="mailbox-link">
          Mailbox
        </Link>
      ) : null}
      <Link href="/account" className="text-ink-soft hover:text-ink">
        Account
      </Link>
    </>
  );
}
