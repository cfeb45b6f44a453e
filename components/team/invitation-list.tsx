'use client';

import { useState } from 'react';
import { Button } from '@/components/ui/button';
import { Card } from '@/components/ui/card';
import { Notice } from '@/components/ui/notice';
import { QueryState } from '@/components/ui/query-state';
import { Table, Td, Th } from '@/components/ui/table';
import { useStudyContext } from '@/components/studies/study-context';
import { ROLE_LABELS } from '@/lib/shared/roles';
import { useInvitations, useResendInvitation, useRevokeInvitation } from '@/lib/client/team';
import { formatDateTime } from '@/lib/shared/format';

/** Open invitations: owners resend (new link, new 7 days) or withdraw them. */
export function InvitationList() {
  const { study } = useStudyContext();
  const invitations = useInvitations(study.id);
  const resend = useResendInvitation(study.id);
  const revoke = useRevokeInvitation(study.id);
  const [note, setNote] = useState<{ tone: 'info' | 'warning' | 'error'; text: string } | null>(null);

  const onResend = (id: number) =>
    resend.mutate(id, {
      onSuccess: (reply) =>
        setNote(
          reply.mailSent
            ? { tone: 'info', text: `Sent again to ${reply.invitation.email}; the earlier link no longer works.` }
            : { tone: 'warning', text: `The mail server did not accept the message for ${reply.invitation.email}. Try again in a moment.` },
        ),
      onError: (error) => setNote({ tone: 'error', text: error.message }),
    });
  const onRevoke = (id: number, email: string) =>
    revoke.mutate(id, {
      onSuccess: () => setNote({ tone: 'info', text: `The invitation for ${email} was withdrawn; its link now says so.` }),
      onError: (error) => setNote({ tone: 'error', text: error.message }),
    });

  return (
    <Card title="Open invitations">
      <div className="space-y-3">
        {note ? <Notice tone={note.tone}>{note.text}</Notice> : null}
        <QueryState query={invitations} label="Loading invitations…">
          {invitations.data?.length === 0 ? (
            <p className="text-sm text-ink-soft">No open invitations.</p>
          ) : (
            <Table caption="Open invitations">
              <thead className="bg-paper-sunk">
                <tr>
                  <Th>E-mail</Th>
                  <Th>Role</Th>
                  <Th>Link works until</Th>
                  <Th>
                    <span className="sr-only">Actions</span>
                  </Th>
                </tr>
              </thead>
              <tbody className="divide-y divide-ink/10">
                {invitations.data?.map((i) => (
                  <tr key={i.id} data-testid="invitation-row">
                    <Td>
                      {i.email}
                      {i.invitedBy ? <span className="block text-xs text-ink-soft">invited by {i.invitedBy}</span> : null}
                    </Td>
                    <Td>{ROLE_LABELS[i.role]}</Td>
                    <Td className={i.state === 'expired' ? 'text-danger-700' : 'text-ink-soft'}>
                      {i.state === 'expired' ? 'Expired ' : ''}
                      {formatDateTime(i.expiresAt)}
                    </Td>
                    <Td className="whitespace-nowrap text-right">
                      <span className="inline-flex gap-2">
                        <Button size="sm" variant="secondary" onClick={() => onResend(i.id)} disabled={resend.isPending}>
                          Resend
                        </Button>
                        <Button size="sm" variant="secondary" onClick={() => onRevoke(i.id, i.email)} disabled={revoke.isPending}>
                          Withdraw
                        </Button>
                      </span>
                    </Td>
                  </tr>
                ))}
              </tbody>
            </Table>
          )}
        </QueryState>
      </div>
    </Card>
  );
}
