'use client';

import type { ReactNode } from 'react';
import { Notice } from '@/components/ui/notice';
import { Table, Td, Th } from '@/components/ui/table';
import { fmtDays, fmtRate, fmtShare, fmtSmall } from '@/lib/shared/planner/format';
import type { DesignSummary } from '@/lib/shared/planner/types';
import { CRITERION_LABELS, CRITERION_TERMS, ROLE_LABELS } from './labels';
import { TermHelp } from '@/components/glossary/term-help';

function Stat({ label, value, testId }: { label: ReactNode; value: string; testId?: string }) {
  return (
    <div className="rounded-md border border-ink/10 bg-paper px-3 py-2">
      <dt className="text-xs text-ink-soft">{label}</dt>
      <dd className="text-lg font-semibold" data-testid={testId}>
        {value}
      </dd>
    </div>
  );
}

/** The design page's numbers: headline values, pattern shares per pair role, the prior's spread of bounds, warnings. */
export function DesignNumbers({ summary: s }: { summary: DesignSummary }) {
  const zone = s.typical.zone;
  const spread = s.boundSpread;
  return (
    <div className="space-y-4">
      {s.warnings.length ? (
        <Notice tone="warning" title="Check before you run this design">
          <ul className="list-disc pl-5" data-testid="design-warnings">
            {s.warnings.map((w, i) => (
              <li key={i}>{w.message}</li>
            ))}
          </ul>
        </Notice>
      ) : null}
      <dl className="grid grid-cols-2 gap-2 md:grid-cols-3">
        <Stat label="Soon delay d (days)" value={fmtDays(s.soonDelay)} testId="stat-soon-delay" />
        <Stat label={s.mode === 'population' ? 'Probe late delay D, everyone (days)' : 'Probe late delay D, typical participant (days)'} value={fmtDays(s.roles[1].lateDelay)} testId="stat-probe-delay" />
        <Stat label={<><TermHelp id="reversal-zone">Reversal zone</TermHelp>, typical participant (days)</>} value={zone ? `${fmtDays(zone.lower)} – ${fmtDays(zone.upper)}` : 'none'} testId="stat-zone" />
        <Stat label={<><TermHelp id="expected-reversal-rate">Expected reversal rate</TermHelp> per probe</>} value={fmtShare(s.expectedReversalRate)} testId="stat-reversal-rate" />
        <Stat label={<>Criterion: <TermHelp id={CRITERION_TERMS[s.criterion]}>{CRITERION_LABELS[s.criterion]}</TermHelp>{s.criterion === 'maximin' ? ' (smallest gap, × L; below 0 means outside some scenario’s zone)' : s.criterion === 'gap-product' ? ' (× L²)' : ''}</>} value={s.criterion === 'expected-reversal-rate' ? fmtShare(s.criterionValue) : fmtSmall(s.criterionValue)} testId="stat-criterion" />
        <Stat label="Share of the prior that can reverse" value={fmtShare(s.reversibleShare)} testId="stat-reversible" />
      </dl>
      <p className="text-xs text-ink-soft">
        Typical participant: the prior’s median rates, k = {fmtRate(s.typical.kSmall)} and K = {fmtRate(s.typical.kLarge)} per day. Expected shares use logistic choice with sensitivity γ = {s.choiceSensitivity} per unit of the large amount
        {s.mode === 'personalised' ? ', and assume the calibration block recovers each participant’s rates exactly (the power simulation drops this assumption)' : ''}.
      </p>
      <Table caption="Expected share of each choice pattern by pair role">
        <thead className="bg-paper-sunk">
          <tr>
            <Th>
              <TermHelp id="pair-roles">Pair role</TermHelp>
            </Th>
            <Th>Pairs</Th>
            <Th>Late delay (days)</Th>
            <Th>
              <TermHelp id="patterns">LL</TermHelp>
            </Th>
            <Th>LS (reversal)</Th>
            <Th>SL</Th>
            <Th>SS</Th>
          </tr>
        </thead>
        <tbody className="divide-y divide-ink/10">
          {s.roles.map((r) => (
            <tr key={r.role} data-testid={`role-${r.role}`}>
              <Td>{ROLE_LABELS[r.role]}</Td>
              <Td>{r.count}</Td>
              <Td>{s.mode === 'personalised' ? `${fmtDays(r.lateDelay)} (typical; each person their own)` : fmtDays(r.lateDelay)}</Td>
              <Td>{fmtShare(r.shares?.LL)}</Td>
              <Td className="font-semibold">{fmtShare(r.shares?.LS)}</Td>
              <Td>{fmtShare(r.shares?.SL)}</Td>
              <Td>{fmtShare(r.shares?.SS)}</Td>
            </tr>
          ))}
        </tbody>
      </Table>
      {spread ? (
        <Table caption="Spread of the reversal-zone bounds over the prior">
          <thead className="bg-paper-sunk">
            <tr>
              <Th>Zone bound over the prior (days)</Th>
              <Th>10th percentile</Th>
              <Th>median</Th>
              <Th>90th percentile</Th>
            </tr>
          </thead>
          <tbody className="divide-y divide-ink/10" data-testid="bound-spread">
            <tr>
              <Td>
                lower bound <TermHelp id="reversal-zone">D_lower</TermHelp>
              </Td>
              <Td>{fmtDays(spread.lower?.p10)}</Td>
              <Td>{fmtDays(spread.lower?.p50)}</Td>
              <Td>{fmtDays(spread.lower?.p90)}</Td>
            </tr>
            <tr>
              <Td>upper bound D_upper</Td>
              <Td>{fmtDays(spread.upper?.p10)}</Td>
              <Td>{fmtDays(spread.upper?.p50)}</Td>
              <Td>{fmtDays(spread.upper?.p90)}</Td>
            </tr>
            <tr>
              <Td colSpan={4} className="text-xs text-ink-soft">
                Over {spread.draws.toLocaleString('en-GB')} draws from the prior, of which {spread.withZone.toLocaleString('en-GB')} can reverse at this ratio and soon delay.
              </Td>
            </tr>
          </tbody>
        </Table>
      ) : null}
    </div>
  );
}
