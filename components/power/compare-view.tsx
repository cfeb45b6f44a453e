'use client';

import Link from 'next/link';
import { useSearchParams } from 'next/navigation';
import { useQueries } from '@tanstack/react-query';
import { buttonClass } from '@/components/ui/button';
import { Card } from '@/components/ui/card';
import { Notice } from '@/components/ui/notice';
import { useStudyContext } from '@/components/studies/study-context';
import { apiFetch } from '@/lib/client/api';
import { powerExportUrl, powerKeys, type PowerRunDto } from '@/lib/client/power';
import { PowerCaution } from './power-caution';
import { PowerChart } from './power-chart';

/** Two or more finished runs on one chart (e.g. the truth as the design assumes vs a misspecified one). */
export function CompareView() {
  const { study } = useStudyContext();
  const ids = (useSearchParams().get('runs') ?? '')
    .split(',')
    .filter((s) => /^\d{1,10}$/.test(s))
    .map(Number)
    .slice(0, 4);
  const queries = useQueries({
    queries: ids.map((id) => ({
      queryKey: powerKeys.run(study.id, id),
      queryFn: () => apiFetch<{ run: PowerRunDto }>(`/api/studies/${study.id}/power-runs/${id}`).then((r) => r.run),
    })),
  });
  const runs = queries.map((q) => q.data).filter((r): r is PowerRunDto => !!r && r.status === 'finished' && !!r.result);
  const failed = queries.find((q) => q.error)?.error as Error | undefined;
  const series = runs.map((r) => ({ label: r.label || `${r.design.name} v${r.design.number}`, points: r.result!.summary.points }));
  return (
    <div className="space-y-6">
      <Link href={`/studies/${study.id}/power`} className="text-sm text-ink-soft hover:text-ink">
        ← All power runs
      </Link>
      {failed ? <Notice tone="error">{failed.message}</Notice> : null}
      {ids.length < 2 ? <Notice tone="warning">Pick two or more finished runs on the power page to compare them.</Notice> : null}
      {runs.length >= 2 ? (
        <Card title="Compared power curves">
          <PowerChart series={series} title="Power: compared runs" />
          <ul className="mt-3 space-y-1 text-sm">
            {runs.map((r) => (
              <li key={r.id}>
                <strong>{r.label || `Run ${r.id}`}</strong>: truth {r.spec.truth.model.id}
                {r.spec.truth.model.sensitivity ? `, s = ${r.spec.truth.model.sensitivity}` : ''}; 80 % power at{' '}
                {r.result!.summary.sampleSizeFor80.kind === 'not-reached' ? 'no simulated N' : `N ≈ ${'n' in r.result!.summary.sampleSizeFor80 ? r.result!.summary.sampleSizeFor80.n : ''}`}
              </li>
            ))}
          </ul>
          <div className="mt-4 flex gap-2">
            <a className={buttonClass('secondary', 'sm')} href={powerExportUrl(study.id, runs[0].id, 'svg', runs.slice(1).map((r) => r.id))} download>
              Download SVG
            </a>
            <a className={buttonClass('secondary', 'sm')} href={powerExportUrl(study.id, runs[0].id, 'png', runs.slice(1).map((r) => r.id))} download>
              Download PNG (300 dpi)
            </a>
          </div>
        </Card>
      ) : ids.length >= 2 && queries.every((q) => !q.isPending) ? (
        <Notice tone="warning">Only finished runs can be compared.</Notice>
      ) : null}
      <PowerCaution />
    </div>
  );
}
