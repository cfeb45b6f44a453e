'use client';

import { Button } from '@/components/ui/button';
import { Notice } from '@/components/ui/notice';
import { useStudyContext } from '@/components/studies/study-context';
import { useCancelPowerRun, useRestartPowerRun, type PowerRunDto } from '@/lib/client/power';
import { WAITING_FOR_WORKER_MESSAGE } from '@/lib/shared/power-queue';

export const STATUS_LABELS: Record<PowerRunDto['status'], string> = {
  queued: 'Queued',
  running: 'Running',
  finished: 'Finished',
  cancelled: 'Cancelled',
  interrupted: 'Interrupted',
  failed: 'Failed',
};

function timeLeft(seconds: number | null): string {
  if (seconds === null) return 'estimating time left…';
  if (seconds < 60) return `about ${Math.max(1, seconds)} s left`;
  return `about ${Math.round(seconds / 60)} min left`;
}

/** Where a queued run stands behind the server's cap on simultaneous runs. */
export function queueText(position: number | null): string {
  if (position === null) return 'starting…';
  return position === 1 ? 'waiting for a free slot: next to start' : `waiting for a free slot: number ${position} in the queue`;
}

/** Progress bar with percent and time left, cancel while running, restart after an interruption. */
export function RunStatus({ run }: { run: PowerRunDto }) {
  const { study, can } = useStudyContext();
  const cancel = useCancelPowerRun(study.id, run.id);
  const restart = useRestartPowerRun(study.id, run.id);
  const editor = can('editor');
  const error = (cancel.error ?? restart.error) as Error | null;
  if (run.status === 'queued' || run.status === 'running') {
    return (
      <div className="space-y-2">
        <div className="flex items-center justify-between text-sm">
          <span>
            {STATUS_LABELS[run.status]}: {run.completed.toLocaleString('en')} of {run.total.toLocaleString('en')} replicates
          </span>
          <span data-testid="power-progress-text">
            {run.percent} % · {run.status === 'queued' ? queueText(run.queuePosition) : timeLeft(run.secondsLeft)}
          </span>
        </div>
        <div role="progressbar" aria-label="Simulation progress" aria-valuemin={0} aria-valuemax={100} aria-valuenow={run.percent} className="h-3 w-full overflow-hidden rounded-full bg-paper-sunk">
          <div className="h-full bg-teal-600 transition-[width]" style={{ width: `${run.percent}%` }} />
        </div>
        {run.status === 'running' && run.message ? (
          <Notice tone={run.message === WAITING_FOR_WORKER_MESSAGE ? 'warning' : 'info'}>
            <span data-testid="power-run-note">{run.message}</span>
          </Notice>
        ) : null}
        {editor ? (
          <Button variant="secondary" size="sm" onClick={() => cancel.mutate()} disabled={cancel.isPending}>
            {cancel.isPending ? 'Cancelling…' : 'Cancel run'}
          </Button>
        ) : null}
        {error ? <Notice tone="error">{error.message}</Notice> : null}
      </div>
    );
  }
  if (run.status === 'finished') return null;
  return (
    <div className="space-y-2">
      <Notice tone={run.status === 'cancelled' ? 'info' : 'warning'} title={`${STATUS_LABELS[run.status]} after ${run.completed} of ${run.total} replicates`}>
        {run.message}
      </Notice>
      {editor ? (
        <Button onClick={() => restart.mutate()} disabled={restart.isPending}>
          {restart.isPending ? 'Restarting…' : 'Restart from the start'}
        </Button>
      ) : null}
      {error ? <Notice tone="error">{error.message}</Notice> : null}
    </div>
  );
}
