import { describeCalibration, stageOneModel } from '../item-bank/calibrationPlan';
import { designChoiceModel } from '../designChoiceModel';
import { describeModel, type PowerSummary } from './summarisePower';
import type { SampleSizeAnswer } from './sampleSizeFor';
import type { PowerScenario } from './types';

export type MethodTextContext = {
  /** e.g. "Switchback 0.1.0 (power engine 1)" */
  software: string;
  /** e.g. "Savings pilot, frozen version 2" */
  designLabel: string;
  /** SHA-256 of the frozen design */
  designHash: string;
};

const TESTS = {
  mcnemar:
    'an exact McNemar test on the reversal probes (LS patterns against SL patterns among discordant probe pairs, pooled over participants). ' +
    'This pooled test assumes that every probe pair is independent; pairs answered by the same person are not, so with more than one probe pair per participant ' +
    'its type I error can exceed α and this power can be optimistic; a participant-level test avoids that',
  sign: 'an exact sign test at the participant level (participants with more LS than SL probe patterns against those with fewer; ties dropped)',
  'sign-flip':
    'an exact sign-flip permutation test at the participant level (Fisher 1935; Pitman 1937) on the sum over participants of each participant’s count of LS minus SL probe patterns, ' +
    'so that several probe pairs of one person count as one unit',
  'probes-vs-anchors':
    'an exact sign test at the participant level on the difference between the LS rate among reversal probes and the LS rate among anchor pairs (ties and participants without anchors dropped)',
} as const;

function prior(p: PowerScenario['truth']['prior']): string {
  return (
    `ln k for the small reward ~ N(ln ${num(p.medianSmall)}, ${num(p.sdLogSmall)}²), ln K for the large reward ~ N(ln ${num(p.medianLarge)}, ${num(p.sdLogLarge)}²), ` +
    `correlation ${num(p.correlation)}`
  );
}

function num(v: number): string {
  return String(Number(v.toPrecision(4)));
}

function answer(a: SampleSizeAnswer, label: string): string {
  if (a.kind === 'interpolated') return `${label} power needs about N = ${a.n} (linear interpolation between the simulated N = ${a.between[0]} and ${a.between[1]})`;
  if (a.kind === 'at-most') return `${label} power is reached at the smallest simulated N = ${a.n} already`;
  return `${label} power is not reached up to N = ${a.largest}`;
}

/**
 * The method paragraph of a power run, stating every simulation setting, the test, the
 * results at 80 % and 90 % power and the software version, for a grant or a preregistration.
 */
export function methodText(
  scenario: PowerScenario,
  summary: PowerSummary,
  context: MethodTextContext,
  stress: ReadonlyArray<{ label: string; summary: PowerSummary }> = [],
): string {
  const { design, truth, test } = scenario;
  const spec = design.spec;
  const sizes = scenario.sampleSizes;
  const calibration =
    spec.mode === 'population'
      ? 'The design is a population design: every participant meets the same pairs, built at the late delay with the largest gap product for the prior median rates; no calibration block is simulated.'
      : scenario.calibration === 'simulated'
        ? `Each simulated participant first answers the design's calibration block (${spec.calibration.itemsPerMagnitude} items per magnitude; ${describeCalibration(spec)}; as the item bank exports it); choices follow the truth, ` +
          `the rates are re-estimated by maximum likelihood under the stage-1 model and its choice model (γ = ${num(designChoiceModel(spec).sensitivity)} per unit of each item's later amount, no lapse), as the probe-items API estimates them` +
          `${stageOneModel(spec) ? ' (in the simulation the delay sensitivity is located on a grid of 17 values from 0.3 to 1.3, refined by a parabola)' : ''}, ` +
          `and the participant's probe block is built from these estimates.`
        : scenario.calibration === 'adaptive'
          ? `Each simulated participant first answers an adaptive calibration (adaptive design optimisation; Myung, Cavagnaro & Pitt 2013): up to ${spec.calibration.adaptive?.maxItems ?? 12} items, ` +
            `each chosen from a candidate set of amounts and delays over the design's calibration range to maximise the expected information about the participant's rates ` +
            `(a grid posterior from the design's prior, updated under the design's choice model, γ = ${num(designChoiceModel(spec).sensitivity)}), stopping early once the posterior SD of ln k and ln K is at most ${num(spec.calibration.adaptive?.targetSd ?? 0.3)}; ` +
            `choices follow the truth, and the probe block is built at the posterior medians.`
          : 'Calibration is not simulated: each participant’s probe block is built from their true rates (the rates are treated as known).'
  const probeBlock =
    `The probe block holds ${spec.probePairs} reversal probe pair(s) around the late delay that maximises the gap product, ${spec.lateAnchors} late anchor pair(s) ` +
    `and ${spec.soonAnchors} soon anchor pair(s) placed as clearly outside the reversal zone as the probes are inside it (late delays limited to ${spec.lateDelayLimit} days, ` +
    'unrounded); participants whose estimates are flagged (all choices one way, or inconsistent) or have no reversal zone receive the fallback set built for the prior medians.'
  const first = summary.points[0];
  const last = summary.points[summary.points.length - 1];
  return [
    `Power was estimated by simulation (${context.software}) for the frozen design "${context.designLabel}" (SHA-256 ${context.designHash}), which assumes the ` +
      `${describeModel(spec.model)} discount function, magnitude ratio ${num(spec.ratio)} (larger amount ${num(spec.largeAmount)} ${spec.currency}), soon delay ${num(design.soonDelay)} days ` +
      `and a ${spec.mode} design.`,
    `Simulated participants discount by the ${describeModel(truth.model)} function with true rates drawn from a bivariate log-normal prior (${prior(truth.prior)}) ` +
      `and choose by a logistic rule on the value difference with sensitivity γ = ${num(truth.gamma)} per unit of the larger amount and a lapse rate ε = ${num(truth.lapse)}.`,
    calibration,
    probeBlock,
    `Each simulated study was analysed with ${TESTS[test.kind]}, ${test.alternative === 'greater' ? 'one-sided (more reversals than reverse reversals)' : 'two-sided'}, at α = ${num(test.alpha)}.`,
    `Power is the share of ${scenario.replications} replicates with p < α, reported with Wilson 95 % intervals, for N = ${sizes.join(', ')}; ` +
      `within each replicate the largest study was simulated once and each smaller N is its first N participants, which is valid because participants are independent ` +
      `and identically distributed. Replicate r used its own generator seeded from the run seed ${scenario.seed}, so the results do not depend on how replicates were split between threads.`,
    `Power was ${pct(first.power)} (${pct(first.lower)}–${pct(first.upper)}) at N = ${first.n} and ${pct(last.power)} (${pct(last.lower)}–${pct(last.upper)}) at N = ${last.n}; ` +
      `${answer(summary.sampleSizeFor80, '80 %')}, and ${answer(summary.sampleSizeFor90, '90 %')}.`,
    ...stressSentences(summary, stress),
    ...monteCarloSentence(scenario.replications, [summary, ...stress.map((t) => t.summary)]),
    'These are estimates from simulated hypothetical choices under the stated assumptions, not a clinical assessment of any person.',
  ].join(' ');
}

function stressSentences(summary: PowerSummary, stress: ReadonlyArray<{ label: string; summary: PowerSummary }>): string[] {
  if (stress.length === 0) return ['Only the assumed truth was simulated: no stress truths (deviations from the design\u2019s assumptions) were added.'];
  const last = summary.points[summary.points.length - 1];
  const parts = stress.map((t) => {
    const p = t.summary.points[t.summary.points.length - 1];
    return `${t.label}: ${pct(p.power)} (${pct(p.lower)}–${pct(p.upper)}) at N = ${p.n}, with ${pct(p.probesInTrueZone)} of probe pairs inside the true reversal zone, and ${answer(t.summary.sampleSizeFor80, '80 %')}`;
  });
  return [
    `To show how power depends on these assumptions, the same design, test and seeds were simulated under ${stress.length} stress truth(s), each one named deviation of the simulated participants from the assumed truth ` +
      `(against ${pct(last.power)} at N = ${last.n} and ${pct(last.probesInTrueZone)} of probe pairs inside the true zone under the assumed truth): ${parts.join('; ')}.`,
  ];
}

function monteCarloSentence(replications: number, summaries: readonly PowerSummary[]): string[] {
  if (replications >= 1000) return [];
  let worst = 0;
  for (const s of summaries) for (const p of s.points) worst = Math.max(worst, Math.sqrt((p.power * (1 - p.power)) / replications));
  return [
    `With fewer than 1,000 replicates (${replications}), each power value carries a Monte Carlo standard error of up to ${(100 * worst).toFixed(1)} percentage points ` +
      '(√(p(1 − p)/R), the largest over the curves); the Wilson intervals above include this error.',
  ];
}

function pct(v: number): string {
  return `${(Math.round(v * 1000) / 10).toFixed(1)} %`;
}
