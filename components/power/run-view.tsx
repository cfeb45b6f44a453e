'use client';

import Link from 'next/link';
import { QueryState } from '@/components/ui/query-state';
import { useStudyContext } from '@/components/studies/study-context';
import { usePowerRun } from '@/lib/client/power';
import { POWER_TEST_LABELS } from '@/lib/shared/validations/power';
import { PowerCaution } from './power-caution';
import { RunResults } from './run-results';
import { RunStatus, STATUS_LABELS } from './run-status';

/** One run: what it simulates, its progress (shared by everyone who opens it), then its results. */
export function RunView({ runId }: { runId: number }) {
  const { study } = useStudyContext();
  const query = usePowerRun(study.id, runId);
  const run = query.data;
  return (
    <div className="space-y-6">
      <Link href={`/studies/${study.id}/power`} className="text-sm text-ink-soft hover:text-ink">
        ← All power runs
      </Link>
      <QueryState query={query} label="Loading the run…">
        {run ? (
          <>
            <div>
              <h2 data-testid="run-title">{run.label || `Run ${run.id}`}</h2>
              <p className="text-sm text-ink-soft">
                {run.design.name}, frozen version {run.design.number} (<span className="font-mono">{run.design.hash.slice(0, 12)}</span>) ·{' '}
                {POWER_TEST_LABELS[run.spec.test.kind]}, α = {run.spec.test.alpha} {run.spec.test.alternative === 'greater' ? 'one-sided' : 'two-sided'} ·{' '}
                {run.spec.replications.toLocaleString('en')} replications, seed {run.spec.seed} · status{' '}
                <span data-testid="run-status">{STATUS_LABELS[run.status]}</span>
              </p>
            </div>
            <RunStatus run={run} />
            {run.status === 'finished' ? <RunResults run={run} studyId={study.id} /> : null}
          </>
        ) : null}
      </QueryState>
      <PowerCaution />
    </div>
  );
}
