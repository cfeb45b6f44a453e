'use client';

import { useState } from 'react';
import { buttonClass } from '@/components/ui/button';
import { Card } from '@/components/ui/card';
import { Notice } from '@/components/ui/notice';
import { Table, Td, Th } from '@/components/ui/table';
import type { SampleSizeAnswer } from '@/lib/design/power/sampleSizeFor';
import { powerExportUrl, type PowerRunDto } from '@/lib/client/power';
import { monteCarloNote, runNotes, runSeries } from '@/lib/shared/power-figure';
import { PowerChart } from './power-chart';

const pct = (v: number) => `${(v * 100).toFixed(1)} %`;

function sampleSizeText(answer: SampleSizeAnswer): string {
  if (answer.kind === 'interpolated') return `about ${answer.n} (interpolated between N = ${answer.between[0]} and ${answer.between[1]})`;
  if (answer.kind === 'at-most') return `${answer.n} or fewer (reached at the smallest N simulated)`;
  return `not reached up to N = ${answer.largest}`;
}

function patternText(shares: { LL: number; LS: number; SL: number; SS: number; pairs: number }): string {
  if (shares.pairs === 0) return '—';
  return `LL ${pct(shares.LL)} · LS ${pct(shares.LS)} · SL ${pct(shares.SL)} · SS ${pct(shares.SS)}`;
}

/** The results of a finished run: chart, sample sizes for 80 % and 90 %, table, method text, warnings, downloads. */
export function RunResults({ run, studyId }: { run: PowerRunDto; studyId: number }) {
  const [copied, setCopied] = useState(false);
  const result = run.result;
  if (!result) return null;
  const { summary } = result;
  const label = run.label || `${run.design.name} v${run.design.number}`;
  const notes = runNotes(run.spec, result);
  const monteCarlo = monteCarloNote(result, run.spec.replications);
  const R = summary.replicates;
  return (
    <div className="space-y-6">
      {summary.warnings.length ? (
        <Notice tone="warning" title="Read before using these numbers">
          <ul className="list-disc space-y-1 pl-5" data-testid="power-warnings">
            {summary.warnings.map((w, i) => (
              <li key={i}>{w.message}</li>
            ))}
          </ul>
        </Notice>
      ) : null}
      <Card title="Power curve">
        <PowerChart series={runSeries(label, result)} title={`Power: ${label}`} caption={`${run.spec.replications} replications, seed ${run.spec.seed}.`} notes={notes} />
        {monteCarlo ? (
          <p className="mt-2 text-sm font-semibold text-amber-800" data-testid="monte-carlo-note">
            {monteCarlo}
          </p>
        ) : null}
        <dl className="mt-4 grid gap-2 text-sm sm:grid-cols-2">
          <div>
            <dt className="font-semibold">Sample size for 80 % power</dt>
            <dd data-testid="n-for-80">{sampleSizeText(summary.sampleSizeFor80)}</dd>
          </div>
          <div>
            <dt className="font-semibold">Sample size for 90 % power</dt>
            <dd data-testid="n-for-90">{sampleSizeText(summary.sampleSizeFor90)}</dd>
          </div>
        </dl>
        <div className="mt-4 flex flex-wrap gap-2">
          {(['svg', 'png', 'csv', 'json'] as const).map((format) => (
            <a key={format} href={powerExportUrl(studyId, run.id, format)} download className={buttonClass('secondary', 'sm')}>
              Download {format === 'png' ? 'PNG (300 dpi)' : format.toUpperCase()}
            </a>
          ))}
        </div>
      </Card>
      {result.stress.length ? <StressTable run={run} result={result} /> : null}
      {result.calibrationComparison ? <CalibrationTable run={run} comparison={result.calibrationComparison} /> : null}
      <Table caption={result.stress.length ? 'Power by sample size under the assumed truth' : 'Power by sample size'}>
        <thead>
          <tr>
            <Th>N</Th>
            <Th>Power</Th>
            <Th>Wilson 95 %</Th>
            {monteCarlo ? <Th>Monte Carlo SE</Th> : null}
            <Th>Mean reversals</Th>
            <Th>Probe patterns</Th>
            <Th>Anchor patterns (late · soon)</Th>
            <Th>Flagged</Th>
          </tr>
        </thead>
        <tbody className="divide-y divide-ink/10">
          {summary.points.map((p) => (
            <tr key={p.n}>
              <Td className="font-mono">{p.n}</Td>
              <Td className="font-mono">{pct(p.power)}</Td>
              <Td className="font-mono">
                {pct(p.lower)} – {pct(p.upper)}
              </Td>
              {monteCarlo ? <Td className="font-mono">±{pct(Math.sqrt((p.power * (1 - p.power)) / R))}</Td> : null}
              <Td className="font-mono">{p.meanReversals.toFixed(2)}</Td>
              <Td className="text-xs">{patternText(p.patterns.probe)}</Td>
              <Td className="text-xs">
                {patternText(p.patterns.lateAnchor)}
                <br />
                {patternText(p.patterns.soonAnchor)}
              </Td>
              <Td className="font-mono">{pct(p.flaggedShare)}</Td>
            </tr>
          ))}
        </tbody>
      </Table>
      <Card
        title="Method paragraph"
        actions={
          <button
            type="button"
            className={buttonClass('ghost', 'sm')}
            onClick={() => navigator.clipboard?.writeText(result.methodText).then(() => setCopied(true), () => setCopied(false))}
          >
            {copied ? 'Copied' : 'Copy'}
          </button>
        }
      >
        <p data-testid="method-text" className="text-sm leading-relaxed">
          {result.methodText}
        </p>
      </Card>
    </div>
  );
}

/** Power under the assumed truth next to each stress truth, at the largest sample size simulated. */
function StressTable({ run, result }: { run: PowerRunDto; result: NonNullable<PowerRunDto['result']> }) {
  const rows = [{ key: 'assumed', label: 'Assumed truth (as the design assumes, or as set for this run)', summary: result.summary }, ...result.stress.map((s) => ({ key: s.stress.kind, label: `Stress: ${s.label}`, summary: s.summary }))];
  const n = result.summary.points[result.summary.points.length - 1].n;
  return (
    <Table caption={`Power under each truth (N = ${n}, ${run.spec.replications} replications each)`}>
      <thead>
        <tr>
          <Th>Truth</Th>
          <Th>Power at N = {n}</Th>
          <Th>Wilson 95 %</Th>
          <Th>Sample size for 80 %</Th>
          <Th>Probes inside the true zone</Th>
        </tr>
      </thead>
      <tbody className="divide-y divide-ink/10" data-testid="stress-table">
        {rows.map((r) => {
          const p = r.summary.points[r.summary.points.length - 1];
          return (
            <tr key={r.key}>
              <Td>{r.label}</Td>
              <Td className="font-mono">{pct(p.power)}</Td>
              <Td className="font-mono">
                {pct(p.lower)} – {pct(p.upper)}
              </Td>
              <Td className="text-xs">{sampleSizeText(r.summary.sampleSizeFor80)}</Td>
              <Td className="font-mono">{pct(p.probesInTrueZone)}</Td>
            </tr>
          );
        })}
      </tbody>
    </Table>
  );
}

/** The design's own calibration next to its other one, truth by truth, at the largest sample size simulated. */
function CalibrationTable({ run, comparison }: { run: PowerRunDto; comparison: NonNullable<NonNullable<PowerRunDto['result']>['calibrationComparison']> }) {
  const last = (s: (typeof comparison.rows)[number]['own']) => s.points[s.points.length - 1];
  const n = last(comparison.rows[0].own).n;
  return (
    <Table caption={`Calibration compared (N = ${n}, ${run.spec.replications} replications each, same seed)`}>
      <thead>
        <tr>
          <Th>Truth</Th>
          <Th>Power, this design’s calibration</Th>
          <Th>Power, the other calibration</Th>
          <Th>Probes inside the true zone, this design’s</Th>
          <Th>Probes inside the true zone, the other</Th>
        </tr>
      </thead>
      <tbody className="divide-y divide-ink/10" data-testid="calibration-table">
        {comparison.rows.map((r) => (
          <tr key={r.truth}>
            <Td>{r.truth}</Td>
            <Td className="font-mono">{pct(last(r.own).power)}</Td>
            <Td className="font-mono">{pct(last(r.other).power)}</Td>
            <Td className="font-mono">{pct(last(r.own).probesInTrueZone)}</Td>
            <Td className="font-mono">{pct(last(r.other).probesInTrueZone)}</Td>
          </tr>
        ))}
      </tbody>
      <tfoot>
        <tr>
          <Td colSpan={5} className="text-xs text-ink-soft">
            This design: {comparison.own}. The other: {comparison.other}. Estimates from simulated choices, not an assessment of any person.
          </Td>
        </tr>
      </tfoot>
    </Table>
  );
}
