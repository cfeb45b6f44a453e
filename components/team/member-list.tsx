'use client';

import { useRouter } from 'next/navigation';
import { useState } from 'react';
import { Button } from '@/components/ui/button';
import { Card } from '@/components/ui/card';
import { Notice } from '@/components/ui/notice';
import { QueryState } from '@/components/ui/query-state';
import { Table, Td, Th } from '@/components/ui/table';
import { useStudyContext } from '@/components/studies/study-context';
import { ROLES, ROLE_LABELS, type Role } from '@/lib/shared/roles';
import { useMembers, type MemberDto } from '@/lib/client/studies';
import { useChangeRole, useRemoveMember } from '@/lib/client/team';
import { formatDateTime } from '@/lib/shared/format';

/** One member's row: owners get a role menu and a remove button; everyone can leave on their own row. */
function MemberRow({ member, currentUserId, onProblem }: { member: MemberDto; currentUserId: number; onProblem: (message: string | null) => void }) {
  const { study, can } = useStudyContext();
  const router = useRouter();
  const changeRole = useChangeRole(study.id);
  const remove = useRemoveMember(study.id);
  const [confirming, setConfirming] = useState(false);
  const self = member.userId === currentUserId;
  const busy = changeRole.isPending || remove.isPending;

  const onRole = (role: Role) => {
    onProblem(null);
    changeRole.mutate({ userId: member.userId, role }, { onError: (error) => onProblem(error.message) });
  };
  const onRemove = () => {
    onProblem(null);
    remove.mutate(member.userId, {
      onSuccess: () => (self ? router.push('/studies') : setConfirming(false)),
      onError: (error) => {
        setConfirming(false);
        onProblem(error.message);
      },
    });
  };

  return (
    <tr data-testid="team-member-row" data-email={member.email}>
      <Td>
        {member.name}
        {self ? <span className="ml-1 text-xs text-ink-soft">(you)</span> : null}
      </Td>
      <Td className="text-ink-soft">{member.email}</Td>
      <Td>
        {can('owner') ? (
          <select
            aria-label={`Role of ${member.name}`}
            className="rounded-md border border-ink/20 bg-paper-raised px-2 py-1 text-sm"
            value={member.role}
            disabled={busy}
            onChange={(e) => onRole(e.target.value as Role)}
          >
            {ROLES.map((r) => (
              <option key={r} value={r}>
                {ROLE_LABELS[r]}
              </option>
            ))}
          </select>
        ) : (
          ROLE_LABELS[member.role]
        )}
      </Td>
      <Td className="whitespace-nowrap text-ink-soft">{formatDateTime(member.since)}</Td>
      <Td className="whitespace-nowrap text-right">
        {can('owner') || self ? (
          confirming ? (
            <span className="inline-flex gap-2">
              <Button size="sm" variant="danger" onClick={onRemove} disabled={busy}>
                {self ? 'Leave now' : 'Remove now'}
              </Button>
              <Button size="sm" variant="secondary" onClick={() => setConfirming(false)}>
                Keep
              </Button>
            </span>
          ) : (
            <Button size="sm" variant="secondary" onClick={() => setConfirming(true)}>
              {self ? 'Leave study' : 'Remove'}
            </Button>
          )
        ) : null}
      </Td>
    </tr>
  );
}

/** The study's members with their roles; owners change roles and remove people here. */
export function MemberList({ currentUserId }: { currentUserId: number }) {
  const { study, can } = useStudyContext();
  const members = useMembers(study.id);
  const [problem, setProblem] = useState<string | null>(null);
  return (
    <Card title="Members">
      <div className="space-y-3">
        {problem ? <Notice tone="error">{problem}</Notice> : null}
        <QueryState query={members} label="Loading members…">
          <Table caption="Study members">
            <thead className="bg-paper-sunk">
              <tr>
                <Th>Name</Th>
                <Th>E-mail</Th>
                <Th>Role</Th>
                <Th>Member since</Th>
                <Th>
                  <span className="sr-only">Actions</span>
                </Th>
              </tr>
            </thead>
            <tbody className="divide-y divide-ink/10">
              {members.data?.map((m) => (
                <MemberRow key={m.userId} member={m} currentUserId={currentUserId} onProblem={setProblem} />
              ))}
            </tbody>
          </Table>
        </QueryState>
        <p className="text-xs text-ink-soft">
          {can('owner')
            ? 'A study always keeps at least one owner: make someone else an owner before you step down or leave.'
            : 'Only owners change roles or remove members. You can leave the study yourself.'}
        </p>
      </div>
    </Card>
  );
}
