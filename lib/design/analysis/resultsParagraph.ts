import { describeModel } from '../power/summarisePower';
import type { ModelId } from '../types';
import type { StudyAnalysis } from './analyseStudy';
import type { PatternCounts } from './patternProbabilities';

export type ResultsContext = {
  /** e.g. "Savings pilot, frozen version 2" */
  designLabel: string;
  /** SHA-256 of the frozen design */
  designHash: string;
  /** e.g. "Main analysis, version 1" */
  analysisLabel: string;
  /** e.g. "Switchback 0.1.0" */
  software: string;
};

const RULE_TEXT = {
  attentionCheck: 'a failed attention check',
  flaggedEstimates: 'flagged calibration estimates',
  incompleteBlocks: 'incomplete blocks',
  responseTimeFloor: 'a response faster than the response-time floor',
} as const;

/**
 * The results paragraph of an analysis with every number filled in: N after exclusions and
 * what each rule removed, observed reversal shares against the design's expectation, the
 * participant-level sign tests (primary) and the pooled McNemar test (secondary, assuming
 * independent pairs), the model comparison (summed AIC and BIC, out-of-sample log score) and
 * the zone diagnosis, ending with the cautions.
 */
export function resultsParagraph(analysis: StudyAnalysis, context: ResultsContext): string {
  const { tests, zones } = analysis;
  const removed = analysis.exclusions.rules.filter((r) => r.enabled);
  const exclusionText = removed.length
    ? `Exclusion rules stated before the analysis removed ${analysis.participantsTotal - analysis.participantsAnalysed} participant(s) (${removed.map((r) => `${RULE_TEXT[r.rule]}: ${r.removes}`).join('; ')})`
    : 'No exclusion rule was applied';
  const probes = analysis.patterns.find((p) => p.role === 'reversal-probe')!;
  const anchors = analysis.patterns.filter((p) => p.role !== 'reversal-probe');
  const anchorPairs = anchors.reduce((s, r) => s + r.pairs, 0);
  const anchorLS = anchors.reduce((s, r) => s + r.observed.LS, 0);
  const sided = analysis.options.alternative === 'greater' ? 'one-sided, more LS than SL' : 'two-sided';
  const sentences = [
    `Observed choices for the frozen design "${context.designLabel}" (SHA-256 ${context.designHash}) were analysed as "${context.analysisLabel}" (${context.software}). ` +
      `${exclusionText}, leaving N = ${analysis.participantsAnalysed} of ${analysis.participantsTotal} participants.`,
    `Among ${probes.pairs} answered reversal probe pairs, ${probes.observed.LS} (${share(probes.observed.LS, probes.pairs)}) showed a preference reversal (LS) and ${probes.observed.SL} (${share(probes.observed.SL, probes.pairs)}) a reverse reversal (SL); ` +
      `the design's model (${describeModel(analysis.options.model)}) with each participant's calibration estimates expected ${expected(probes.expected.design, probes.pairs)} LS. ` +
      `Among ${anchorPairs} anchor pairs, ${anchorLS} (${share(anchorLS, anchorPairs)}) were LS.`,
    `At the participant level (primary analysis; ${sided}), ${tests.signTest.positive} participants showed more LS than SL probe patterns and ${tests.signTest.negative} fewer ` +
      `(${tests.signTest.ties} ties, ${tests.signTest.notScored} without probes), exact sign test ${p(tests.signTest.pValue)}; ` +
      `the LS share among probes exceeded that among anchors for ${tests.probesVsAnchors.positive} and fell below it for ${tests.probesVsAnchors.negative} participants, ${p(tests.probesVsAnchors.pValue)}. ` +
      `Pooled over pairs, the exact McNemar test of ${tests.pooledMcNemar.ls} LS against ${tests.pooledMcNemar.sl} SL gave ${p(tests.pooledMcNemar.pValue)} (secondary: it assumes independent pairs, which a person's pairs are not).`,
    modelText(analysis),
    zones === null
      ? ''
      : `Under the refitted ${name(zones.model)} model, ${zones.probes.inside} of ${zones.probes.before + zones.probes.inside + zones.probes.after + zones.probes['no-zone']} probes fell inside the participant's reversal zone, ` +
        `${zones.probes.before} before it and ${zones.probes.after} after it (${zones.probes['no-zone']} with no zone); ${zones.extrapolated} participant(s) had probes beyond 3 times their longest calibration delay.`,
    `Estimates are from hypothetical choices of this sample and describe choice patterns, not a clinical assessment of any person; discount rates are not a diagnostic test. ` +
      `Studies with real rewards or deception follow the local ethics board's rules.`,
  ];
  return sentences.filter(Boolean).join(' ');
}

function modelText(analysis: StudyAnalysis): string {
  const c = analysis.comparison;
  if (c.bestByAic === null || c.bestByBic === null) return '';
  const sorted = [...c.models].sort((a, b) => a.bic - b.bic);
  const list = sorted.map((m) => `${name(m.model)} ΔBIC ${m.deltaBic.toFixed(1)} (best for ${m.bestByBic})`).join(', ');
  const predicted = c.bestByPrediction
    ? ` Predicting stage-2 choices from calibration-only fits, the ${name(c.bestByPrediction)} model scored best (mean log score ${c.models.find((m) => m.model === c.bestByPrediction)!.predictiveLogScorePerChoice!.toFixed(3)} per choice).`
    : '';
  return (
    `Each participant was refitted on calibration and stage-2 choices under six models by maximum likelihood (rates, and delay sensitivity or present bias where the model has them; choice sensitivity γ = ${analysis.options.choice.sensitivity} held fixed). ` +
    `Summed over participants, the ${name(c.bestByBic)} model had the smallest BIC and the ${name(c.bestByAic)} model the smallest AIC; ${list}.${predicted}`
  );
}

const NAMES: Record<ModelId, string> = {
  exponential: 'exponential',
  hyperbolic: 'hyperbolic',
  hyperboloid: 'hyperboloid',
  'power-delay': 'power-delay',
  'exponential-power': 'exponential-power',
  'quasi-hyperbolic': 'quasi-hyperbolic',
};

function name(id: ModelId): string {
  return NAMES[id];
}

function share(x: number, n: number): string {
  return n === 0 ? '–' : `${(Math.round((1000 * x) / n) / 10).toFixed(1)} %`;
}

function expected(counts: PatternCounts, n: number): string {
  return `${counts.LS.toFixed(1)} (${share(counts.LS, n)})`;
}

function p(v: number): string {
  return v < 0.001 ? 'p < 0.001' : `p = ${v.toFixed(3)}`;
}
