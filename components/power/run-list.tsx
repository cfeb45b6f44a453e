'use client';

import Link from 'next/link';
import { useRouter } from 'next/navigation';
import { useState } from 'react';
import { Button } from '@/components/ui/button';
import { QueryState } from '@/components/ui/query-state';
import { Table, Td, Th } from '@/components/ui/table';
import { useStudyContext } from '@/components/studies/study-context';
import { usePowerRuns } from '@/lib/client/power';
import { formatDateTime } from '@/lib/shared/format';
import { WAITING_FOR_WORKER_MESSAGE } from '@/lib/shared/power-queue';
import { STATUS_LABELS } from './run-status';

/** The study's runs with live progress; tick two or more finished runs to compare them on one chart. */
export function RunList() {
  const { study } = useStudyContext();
  const router = useRouter();
  const query = usePowerRuns(study.id);
  const [picked, setPicked] = useState<number[]>([]);
  const toggle = (id: number) => setPicked((p) => (p.includes(id) ? p.filter((x) => x !== id) : [...p, id].slice(-4)));
  return (
    <QueryState query={query} label="Loading power runs…">
      {query.data?.length ? (
        <div className="space-y-3">
          <Table caption="Power runs">
            <thead>
              <tr>
                <Th>Compare</Th>
                <Th>Run</Th>
                <Th>Design</Th>
                <Th>Status</Th>
                <Th>Started</Th>
              </tr>
            </thead>
            <tbody className="divide-y divide-ink/10">
              {query.data.map((run) => (
                <tr key={run.id}>
                  <Td>
                    <input
                      type="checkbox"
                      aria-label={`Compare ${run.label || `run ${run.id}`}`}
                      disabled={run.status !== 'finished'}
                      checked={picked.includes(run.id)}
                      onChange={() => toggle(run.id)}
                    />
                  </Td>
                  <Td>
                    <Link href={`/studies/${study.id}/power/${run.id}`} className="font-medium text-teal-700 hover:underline">
                      {run.label || `Run ${run.id}`}
                    </Link>
                    <div className="text-xs text-ink-soft">
                      {run.spec.replications.toLocaleString('en')} replications · N {run.spec.sampleSizes[0]}–{run.spec.sampleSizes[run.spec.sampleSizes.length - 1]}
                    </div>
                  </Td>
                  <Td className="text-sm">
                    {run.design.name} v{run.design.number}
                  </Td>
                  <Td className="text-sm">
                    {STATUS_LABELS[run.status]}
                    {run.status === 'running' ? ` · ${run.percent} %` : ''}
                    {run.status === 'running' && run.message === WAITING_FOR_WORKER_MESSAGE ? (
                      <span data-testid="waiting-for-worker" className="block text-xs text-amber-800">
                        waiting for a queue worker: start <code>npm run worker</code>
                      </span>
                    ) : null}
                    {run.status === 'queued' && run.queuePosition !== null ? <span data-testid="queue-position"> · position {run.queuePosition} in the queue</span> : null}
                  </Td>
                  <Td className="text-xs text-ink-soft">
                    {formatDateTime(run.createdAt)}
                    {run.createdBy ? ` by ${run.createdBy}` : ''}
                  </Td>
                </tr>
              ))}
            </tbody>
          </Table>
          <Button variant="secondary" disabled={picked.length < 2} onClick={() => router.push(`/studies/${study.id}/power/compare?runs=${picked.join(',')}`)}>
            Compare {picked.length >= 2 ? `${picked.length} runs` : 'two or more finished runs'} on one chart
          </Button>
        </div>
      ) : (
        <p className="text-sm text-ink-soft">No power runs yet.</p>
      )}
    </QueryState>
  );
}
