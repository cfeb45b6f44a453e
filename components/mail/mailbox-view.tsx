'use client';

import { useState, type ReactNode } from 'react';
import { Card } from '@/components/ui/card';
import { Notice } from '@/components/ui/notice';
import { QueryState } from '@/components/ui/query-state';
import { useMailbox, type MailboxMessageDto } from '@/lib/client/team';
import { formatDateTime } from '@/lib/shared/format';

/** Plain text with its web addresses turned into links (the text itself is never parsed as HTML). */
function withLinks(text: string): ReactNode[] {
  return text.split(/(https?:\/\/[^\s<>"]+)/g).map((part, i) =>
    /^https?:\/\//.test(part) ? (
      <a key={i} href={part} className="break-all text-teal-700 underline">
        {part}
      </a>
    ) : (
      part
    ),
  );
}

function MessageView({ message }: { message: MailboxMessageDto }) {
  return (
    <article className="space-y-3" data-testid="mailbox-message">
      <header className="space-y-1 border-b border-ink/10 pb-3 text-sm">
        <h2 className="text-base">{message.subject}</h2>
        <p className="text-ink-soft">
          From {message.from} · to <span data-testid="mailbox-message-to">{message.to}</span> · {formatDateTime(message.receivedAt)}
        </p>
      </header>
      <div className="whitespace-pre-wrap text-sm leading-relaxed">{withLinks(message.text)}</div>
    </article>
  );
}

/** The messages the local test mail server kept for the signed-in user's address, newest first, with the chosen one beside the list. */
export function MailboxView() {
  const query = useMailbox();
  const [chosen, setChosen] = useState<string | null>(null);
  const messages = query.data?.messages ?? [];
  const current = messages.find((m) => m.id === chosen) ?? messages[0];
  return (
    <div className="space-y-4">
      <div>
        <h1>Mailbox</h1>
        <p className="mt-1 text-sm text-ink-soft">
          Messages Switchback sent to your address{query.data?.address ? ` (${query.data.address})` : ''} through its local test mail server. Nothing here
          left this computer, and each person sees only the mail sent to their own address. Set SMTP_URL to deliver mail for real.
        </p>
      </div>
      <QueryState query={query} label="Loading the mailbox…">
        {query.data && !query.data.enabled ? (
          <Notice>Mail goes to a real mail server here, so there is no local mailbox.</Notice>
        ) : messages.length === 0 ? (
          <Notice>No messages for your address yet. Confirmation links, invitations and password-reset links sent to it appear here a moment after they are sent.</Notice>
        ) : (
          <div className="grid gap-6 lg:grid-cols-3">
            <ul className="divide-y divide-ink/10 overflow-hidden rounded-lg border border-ink/10 bg-paper-raised" aria-label="Messages">
              {messages.map((m) => (
                <li key={m.id}>
                  <button
                    type="button"
                    onClick={() => setChosen(m.id)}
                    aria-current={current?.id === m.id ? 'true' : undefined}
                    className={`block w-full px-4 py-3 text-left text-sm hover:bg-paper-sunk ${current?.id === m.id ? 'bg-teal-50' : ''}`}
                    data-testid="mailbox-item"
                  >
                    <span className="block truncate font-medium">{m.subject}</span>
                    <span className="block truncate text-xs text-ink-soft">
                      to {m.to} · {formatDateTime(m.receivedAt)}
                    </span>
                  </button>
                </li>
              ))}
            </ul>
            <Card className="lg:col-span-2">{current ? <MessageView message={current} /> : null}</Card>
          </div>
        )}
      </QueryState>
    </div>
  );
}
