'use client';

import Link from 'next/link';
import { buttonClass } from '@/components/ui/button';
import { QueryState } from '@/components/ui/query-state';
import { Table, Td, Th } from '@/components/ui/table';
import { ROLE_LABELS } from '@/lib/shared/roles';
import { useStudies } from '@/lib/client/studies';
import { formatDateTime } from '@/lib/shared/format';

export function StudyList() {
  const query = useStudies();
  return (
    <div className="space-y-6">
      <div className="flex items-end justify-between gap-4">
        <div>
          <h1>Your studies</h1>
          <p className="text-sm text-ink-soft">Every study you belong to, with your role in it.</p>
        </div>
        <Link href="/studies/new" className={buttonClass('primary')}>
          New study
        </Link>
      </div>
      <QueryState query={query} label="Loading your studies…">
        {query.data && query.data.length === 0 ? (
          <p className="rounded-lg border border-dashed border-ink/20 p-8 text-center text-ink-soft">
            You are not in any study yet. Create one, or ask a study owner to invite you.
          </p>
        ) : (
          <Table caption="Your studies">
            <thead className="bg-paper-sunk">
              <tr>
                <Th>Study</Th>
                <Th>Your role</Th>
                <Th>Last change</Th>
              </tr>
            </thead>
            <tbody className="divide-y divide-ink/10">
              {query.data?.map((study) => (
                <tr key={study.id} data-testid="study-row">
                  <Td>
                    <Link href={`/studies/${study.id}`} className="font-medium text-teal-700 hover:underline">
                      {study.name}
                    </Link>
                  </Td>
                  <Td>{ROLE_LABELS[study.role]}</Td>
                  <Td className="text-ink-soft">{formatDateTime(study.updatedAt)}</Td>
                </tr>
              ))}
            </tbody>
          </Table>
        )}
      </QueryState>
    </div>
  );
}
