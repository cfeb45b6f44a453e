'use client';

import { useState } from 'react';
import { Button, buttonClass } from '@/components/ui/button';
import { Card } from '@/components/ui/card';
import { TextField } from '@/components/ui/field';
import { QueryState } from '@/components/ui/query-state';
import { Table, Td, Th } from '@/components/ui/table';
import { useSessions, useSetIdleMinutes, type SessionStatusDto } from '@/lib/client/item-bank';
import { formatDateTime } from '@/lib/shared/format';

const STATUSES: SessionStatusDto[] = ['started', 'calibrated', 'served', 'completed', 'abandoned'];

/** Every participant's session status, with counts that filter the list, the CSV export and the idle time. */
export function SessionsCard({ studyId, canOperate }: { studyId: number; canOperate: boolean }) {
  const [filter, setFilter] = useState<SessionStatusDto | null>(null);
  const sessions = useSessions(studyId, filter);
  return (
    <Card
      title="Sessions"
      actions={
        <a className={buttonClass('secondary', 'sm')} href={`/api/studies/${studyId}/sessions?format=csv${filter ? `&status=${filter}` : ''}`} download>
          Export sessions CSV
        </a>
      }
    >
      <QueryState query={sessions} label="Loading sessions…">
        {sessions.data ? (
          <div className="space-y-4">
            <div className="flex flex-wrap gap-2" role="group" aria-label="Filter sessions by status">
              <Button size="sm" variant={filter === null ? 'primary' : 'secondary'} aria-pressed={filter === null} onClick={() => setFilter(null)}>
                all
              </Button>
              {STATUSES.map((s) => (
                <Button key={s} size="sm" variant={filter === s ? 'primary' : 'secondary'} aria-pressed={filter === s} onClick={() => setFilter(s)} data-testid={`session-count-${s}`}>
                  {s} {sessions.data.counts[s]}
                </Button>
              ))}
            </div>
            <p className="text-xs text-ink-soft">A session that is not completed reads as abandoned after {sessions.data.idleMinutes} minutes without activity.</p>
            {sessions.data.sessions.length ? (
              <Table caption="Participant sessions">
                <thead className="bg-paper-sunk">
                  <tr>
                    <Th>Participant</Th>
                    <Th>Status</Th>
                    <Th>Stage-2 answers</Th>
                    <Th>Via</Th>
                    <Th>Last activity</Th>
                  </tr>
                </thead>
                <tbody className="divide-y divide-ink/10">
                  {sessions.data.sessions.map((s) => (
                    <tr key={s.participantId} data-testid="session-row">
                      <Td className="font-mono text-xs">{s.participantId}</Td>
                      <Td>{s.status}</Td>
                      <Td className="tabular-nums">{s.itemCount ? `${s.answered} of ${s.itemCount}` : '—'}</Td>
                      <Td>{s.source}</Td>
                      <Td>{formatDateTime(s.lastActivityAt)}</Td>
                    </tr>
                  ))}
                </tbody>
              </Table>
            ) : (
              <p className="text-sm text-ink-soft">No sessions{filter ? ` with status ${filter}` : ''} yet.</p>
            )}
            {canOperate ? <IdleTimeForm studyId={studyId} current={sessions.data.idleMinutes} /> : null}
          </div>
        ) : null}
      </QueryState>
    </Card>
  );
}

function IdleTimeForm({ studyId, current }: { studyId: number; current: number }) {
  const save = useSetIdleMinutes(studyId);
  const [value, setValue] = useState(String(current));
  return (
    <form
      className="flex flex-wrap items-end gap-2"
      onSubmit={(e) => {
        e.preventDefault();
        save.mutate(Number(value));
      }}
    >
      <TextField label="Abandoned after (minutes idle)" type="number" min={5} max={43200} value={value} onChange={(e) => setValue(e.target.value)} error={save.error?.message} />
      <Button type="submit" size="sm" variant="secondary" disabled={save.isPending}>
        Save idle time
      </Button>
    </form>
  );
}
