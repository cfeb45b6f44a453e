'use client';

import Link from 'next/link';
import { Card } from '@/components/ui/card';
import { QueryState } from '@/components/ui/query-state';
import { Table, Td, Th } from '@/components/ui/table';
import { ROLE_LABELS } from '@/lib/shared/roles';
import { useMembers } from '@/lib/client/studies';
import { formatDateTime } from '@/lib/shared/format';
import { useStudyContext } from './study-context';
import { RenameStudyForm } from './rename-study-form';
import { DeleteStudy } from './delete-study';

export function StudyOverview() {
  const { study, can } = useStudyContext();
  const members = useMembers(study.id);
  return (
    <div className="grid gap-6 lg:grid-cols-3">
      <div className="space-y-6 lg:col-span-2">
        <Card title="About this study">
          <p className="whitespace-pre-line text-sm text-ink">{study.description || 'No description yet.'}</p>
          <p className="mt-3 text-xs text-ink-soft">
            Created {formatDateTime(study.createdAt)} · last changed {formatDateTime(study.updatedAt)} · version {study.version}
          </p>
        </Card>
        <Card
          title="Members"
          actions={
            <Link href={`/studies/${study.id}/team`} className="text-sm text-teal-700 underline">
              {can('owner') ? 'Manage the team' : 'Team'}
            </Link>
          }
        >
          <QueryState query={members} label="Loading members…">
            <Table caption="Study members">
              <thead className="bg-paper-sunk">
                <tr>
                  <Th>Name</Th>
                  <Th>E-mail</Th>
                  <Th>Role</Th>
                </tr>
              </thead>
              <tbody className="divide-y divide-ink/10">
                {members.data?.map((m) => (
                  <tr key={m.userId} data-testid="member-row">
                    <Td>{m.name}</Td>
                    <Td className="text-ink-soft">{m.email}</Td>
                    <Td>{ROLE_LABELS[m.role]}</Td>
                  </tr>
                ))}
              </tbody>
            </Table>
          </QueryState>
        </Card>
      </div>
      {can('owner') ? (
        <div className="space-y-6">
          <RenameStudyForm />
          <DeleteStudy />
        </div>
      ) : null}
    </div>
  );
}
