import { describe, expect, it } from 'vitest';
import binomialTest from '@stdlib/stats-binomial-test';
import {
  analyseStudy,
  applyExclusions,
  choiceProbability,
  compareModels,
  comparePatterns,
  fitModel,
  packChoices,
  participantChoices,
  participantsToAnalyse,
  DesignInputError,
  diagnoseZones,
  preferenceGaps,
  refitParticipant,
  resultsParagraph,
  reversalTests,
  simulateStudy,
  type ObservedPair,
  type ParticipantData,
  type ExclusionRules,
} from '@/lib/design';
import { design, truth } from './support';

const pairOf = (role: ObservedPair['role'], far: 'sooner' | 'later', near: 'sooner' | 'later', D = 90, id = `${role}-${far}-${near}-${D}`): ObservedPair => ({
  pairId: id,
  role,
  far: { itemId: `${id}-far`, soonerAmount: 60, soonerDelay: 30, laterAmount: 100, laterDelay: D, choice: far },
  near: { itemId: `${id}-near`, soonerAmount: 60, soonerDelay: 0, laterAmount: 100, laterDelay: D - 30, choice: near },
});
const LS = (role: ObservedPair['role'] = 'reversal-probe', D?: number) => pairOf(role, 'later', 'sooner', D);
const SL = (role: ObservedPair['role'] = 'reversal-probe') => pairOf(role, 'sooner', 'later');
const LL = (role: ObservedPair['role'] = 'reversal-probe') => pairOf(role, 'later', 'later');
const person = (id: string, pairs: ObservedPair[], extra: Partial<ParticipantData> = {}): ParticipantData => ({
  participantId: id,
  calibration: [],
  pairs: pairs.map((p, i) => ({ ...p, pairId: `${p.pairId}-${i}` })),
  attentionCheck: 'passed',
  estimateFlag: null,
  ...extra,
});

const allOff: ExclusionRules = { attentionCheck: false, flaggedEstimates: false, incompleteBlocks: false, responseTimeFloor: { enabled: false, ms: 0 } };

describe('participant-level tests of reversals', () => {
  const people = [
    person('a', [LS(), LS(), SL(), LL(), LL('late-anchor')]), // +1; probes 2/4 LS vs anchors 0
    person('b', [LS(), LL(), LL(), LL(), LS('soon-anchor')]), // +1; 1/4 vs 1/1: negative
    person('c', [SL(), SL(), LS(), LL(), LL('soon-anchor')]), // −1; 1/4 vs 0: positive
    person('d', [LS(), SL(), LL(), LL(), LL('late-anchor')]), // tie; 1/4 vs 0: positive
    person('e', [LS(), LS(), LS(), LS()]), // +1; no anchors: not scored
    person('f', [LL('late-anchor')]), // no probes
  ];

  it('counts participants above, below and at zero, and matches an independent exact binomial test', () => {
    const result = reversalTests(people, { alternative: 'greater' });
    expect(result.signTest).toMatchObject({ positive: 3, negative: 1, ties: 1, notScored: 1 });
    expect(result.probesVsAnchors).toMatchObject({ positive: 3, negative: 1, ties: 0, notScored: 2 });
    // second opinion: @stdlib/stats-binomial-test, exact binomial at 1/2
    expect(result.signTest.pValue).toBeCloseTo(binomialTest(3, 4, { p: 0.5, alternative: 'greater' }).pValue, 14);
    expect(result.signTest.pValue).toBeCloseTo(5 / 16, 15); // exact arithmetic: (4 + 1)/2^4
    const twoSided = reversalTests(people, { alternative: 'two-sided' });
    expect(twoSided.probesVsAnchors.pValue).toBeCloseTo(binomialTest(3, 4, { p: 0.5, alternative: 'two-sided' }).pValue, 14);
  });

  it('pools LS against SL over probe pairs in the McNemar test and labels it as assuming independent pairs', () => {
    const result = reversalTests(people, { alternative: 'two-sided' });
    expect(result.pooledMcNemar).toMatchObject({ ls: 9, sl: 4, assumesIndependentPairs: true });
    // second opinion: @stdlib/stats-binomial-test; McNemar's exact test is the binomial test of b in b + c at 1/2
    expect(result.pooledMcNemar.pValue).toBeCloseTo(binomialTest(9, 13, { p: 0.5, alternative: 'two-sided' }).pValue, 14);
  });

  it('sweeps many counts against the independent library', () => {
    for (let n = 0; n <= 40; n += 5) {
      for (let positive = 0; positive <= n; positive += 3) {
        const group = [
          ...Array.from({ length: positive }, (_, i) => person(`p${i}`, [LS()])),
          ...Array.from({ length: n - positive }, (_, i) => person(`n${i}`, [SL()])),
        ];
        const result = reversalTests(group, { alternative: 'greater' });
        const expected = n === 0 ? 1 : binomialTest(positive, n, { p: 0.5, alternative: 'greater' }).pValue;
        // sums of at most 41 positive terms: 1e-12 is honest
        expect(Math.abs(result.signTest.pValue - expected)).toBeLessThan(1e-12);
      }
    }
  });

  it('refuses an unknown alternative', () => {
    expect(() => reversalTests([], { alternative: 'less' as never })).toThrow(DesignInputError);
  });
});

describe('observed against expected patterns', () => {
  const data = simulateStudy({ design: design(), truth: truth({ id: 'hyperbolic' }, 10), participants: 12, seed: 4 });
  const choice = { sensitivity: 10 };
  const refits = data.map((p) => refitParticipant(p, { model: { id: 'hyperbolic' }, choice }));
  const rows = comparePatterns(data, refits, choice);

  it('counts every answered pair once per role and expects as many pairs as it observes', () => {
    expect(rows.map((r) => r.role)).toEqual(['late-anchor', 'reversal-probe', 'soon-anchor']);
    for (const row of rows) {
      const observed = row.observed.LL + row.observed.LS + row.observed.SL + row.observed.SS;
      expect(observed).toBe(row.pairs);
      for (const counts of Object.values(row.expected)) {
        // sums of probabilities that add to 1 per pair: 1e-9 is honest
        expect(counts.LL + counts.LS + counts.SL + counts.SS).toBeCloseTo(row.pairs, 9);
      }
    }
    expect(Object.keys(rows[0].expected)).toEqual(['design', 'exponential', 'hyperbolic', 'hyperboloid', 'power-delay', 'exponential-power', 'quasi-hyperbolic']);
  });

  it('expects under the design what preferenceGaps and choiceProbability give at the calibration estimates', () => {
    // independent path: the public gap and choice functions of docs/mathematics.md at each participant's estimates
    let ls = 0;
    data.forEach((p, i) => {
      const { kSmall, kLarge } = refits[i].design.parameters;
      for (const pair of p.pairs.filter((q) => q.role === 'reversal-probe')) {
        const x = pair.far.soonerAmount / pair.far.laterAmount;
        const gaps = preferenceGaps({ model: { id: 'hyperbolic' }, ratio: x, soonDelay: pair.far.soonerDelay, lateDelay: pair.far.laterDelay, kSmall, kLarge });
        ls += choiceProbability(choice, gaps.far) * choiceProbability(choice, gaps.near);
      }
    });
    expect(rows[1].expected.design.LS).toBeCloseTo(ls, 9);
  });
});

describe('zone diagnosis', () => {
  it('places probes before, inside and after the hyperbolic zone from its closed form', () => {
    const probes = [LS('reversal-probe', 40), LS('reversal-probe', 100), LS('reversal-probe', 400)];
    const p = person('z', [...probes, LL('late-anchor')], {
      calibration: [{ itemId: 'c1', magnitude: 'small', soonerAmount: 50, soonerDelay: 0, laterAmount: 60, laterDelay: 30, choice: 'later' }],
    });
    const kSmall = 0.05;
    const kLarge = 0.01;
    const fit = { parameters: { kSmall, kLarge, sensitivity: 1, presentBias: 1 } };
    const refit = { participantId: 'z', design: fit, models: [{ model: 'hyperbolic', full: fit, calibrationOnly: fit, predictiveLogScore: 0, predictedChoices: 0 }] } as never;
    const result = diagnoseZones([p], [refit], { model: 'hyperbolic' });
    // closed form (docs/mathematics.md, "Closed forms"): D_lower = d + (1 − x)/(xK) = 30 + 0.4/0.006 ≈ 96.7, D_upper = (1 + kd − x)/(xK) = 1.9/0.006 ≈ 316.7
    const x = 0.6;
    expect(result.participants[0].zone!.lower).toBeCloseTo(30 + (1 - x) / (x * kLarge), 9);
    expect(result.participants[0].zone!.upper).toBeCloseTo((1 + kSmall * 30 - x) / (x * kLarge), 9);
    expect(result.participants[0].probes.map((q) => q.position)).toEqual(['before', 'inside', 'after']);
    expect(result.probes).toEqual({ before: 1, inside: 1, after: 1, 'no-zone': 0 });
    // the probes reach 400 days against a longest calibration delay of 30: extrapolated
    expect(result.extrapolated).toBe(1);
    expect(result.findings.join(' ')).toContain('1 of 3 probes');
  });

  it('says there is no zone when small rewards are discounted no faster than large ones (k ≤ xK)', () => {
    const p = person('n', [LS()]);
    const fit = { parameters: { kSmall: 0.005, kLarge: 0.01, sensitivity: 1, presentBias: 1 } };
    const refit = { participantId: 'n', design: fit, models: [{ model: 'hyperbolic', full: fit, calibrationOnly: fit, predictiveLogScore: 0, predictedChoices: 0 }] } as never;
    expect(diagnoseZones([p], [refit], { model: 'hyperbolic' }).participants[0].counts['no-zone']).toBe(1);
  });
});

describe('exclusions stated before looking', () => {
  const people = [
    person('ok', [LS()]),
    person('att', [LS()], { attentionCheck: 'failed' }),
    person('flag', [LS()], { estimateFlag: 'all-sooner' }),
    person('both', [LS()], { attentionCheck: 'failed', estimateFlag: 'non-monotone' }),
    person('gap', [{ ...LS(), near: { ...LS().near, choice: null } }]),
    person('fast', [{ ...LS(), far: { ...LS().far, responseTimeMs: 150 } }]),
  ];

  it('reports what each rule applies to, on or off, and what it removes in order', () => {
    const report = applyExclusions(people, { attentionCheck: true, flaggedEstimates: true, incompleteBlocks: false, responseTimeFloor: { enabled: true, ms: 200 } });
    expect(report.kept.map((p) => p.participantId)).toEqual(['ok', 'gap']);
    expect(report.rules).toEqual([
      { rule: 'attentionCheck', enabled: true, applies: 2, removes: 2 },
      { rule: 'flaggedEstimates', enabled: true, applies: 2, removes: 1 },
      { rule: 'incompleteBlocks', enabled: false, applies: 1, removes: 0 },
      { rule: 'responseTimeFloor', enabled: true, applies: 1, removes: 1 },
    ]);
    expect(report.excluded.find((e) => e.participantId === 'both')!.reasons).toEqual(['attentionCheck', 'flaggedEstimates']);
    expect(applyExclusions(people, allOff).kept).toHaveLength(6);
  });

  it('refuses a missing switch or a negative floor, naming it', () => {
    expect(() => applyExclusions([], { ...allOff, attentionCheck: 'yes' as never })).toThrow(/rules.attentionCheck/);
    expect(() => applyExclusions([], { ...allOff, responseTimeFloor: { enabled: true, ms: -1 } })).toThrow(/rules.responseTimeFloor.ms/);
  });
});

describe('whole analysis and its paragraph', () => {
  const data = simulateStudy({ design: design(), truth: truth({ id: 'hyperbolic' }, 10, 0.02), participants: 20, seed: 21, attentionFailureRate: 0.1 });
  const analysis = analyseStudy(data, {
    model: { id: 'hyperbolic' },
    choice: { sensitivity: 10 },
    exclusions: { attentionCheck: true, flaggedEstimates: true, incompleteBlocks: true, responseTimeFloor: { enabled: false, ms: 200 } },
    alternative: 'greater',
  });

  it('takes refits computed elsewhere (worker processes) for the participants participantsToAnalyse names, with the same result', () => {
    const rules = { attentionCheck: true, flaggedEstimates: true, incompleteBlocks: true, responseTimeFloor: { enabled: false, ms: 200 } };
    const kept = participantsToAnalyse(data, rules);
    expect(kept).toHaveLength(analysis.participantsAnalysed);
    expect(kept.length).toBeLessThan(data.length); // the attention failures are left out
    const refits = kept.map((p) => refitParticipant(p, { model: { id: 'hyperbolic' }, choice: { sensitivity: 10 }, confidence: 0.95 }));
    expect(analyseStudy(data, { model: { id: 'hyperbolic' }, choice: { sensitivity: 10 }, exclusions: rules, alternative: 'greater', refits })).toEqual(analysis);
    expect(participantsToAnalyse([], rules)).toEqual([]);
  });

  it('is reproducible from the seed', () => {
    const again = simulateStudy({ design: design(), truth: truth({ id: 'hyperbolic' }, 10, 0.02), participants: 20, seed: 21, attentionFailureRate: 0.1 });
    expect(again).toEqual(data);
  });

  it('writes a paragraph with every number filled in and the cautions', () => {
    const text = resultsParagraph(analysis, { designLabel: 'Harbourlight savings, version 1', designHash: 'f'.repeat(64), analysisLabel: 'Main analysis, version 1', software: 'Switchback 0.1.0' });
    expect(text).toContain(`N = ${analysis.participantsAnalysed} of 20`);
    expect(text).toContain(`${analysis.tests.signTest.positive} participants showed more LS than SL`);
    expect(text).toContain(`${analysis.tests.pooledMcNemar.ls} LS against ${analysis.tests.pooledMcNemar.sl} SL`);
    expect(text).toContain('assumes independent pairs');
    expect(text).toContain(`the ${analysis.comparison.bestByBic} model had the smallest BIC`);
    expect(text).toContain('not a clinical assessment');
    expect(text).toContain('hypothetical choices');
    expect(text).not.toMatch(/undefined|NaN|null/);
  });

  it('diagnoses zones under the model with the smallest summed BIC by default', () => {
    expect(analysis.zones!.model).toBe(analysis.comparison.bestByBic);
    expect(analysis.zones!.participants).toHaveLength(analysis.participantsAnalysed);
  });

  it('refuses an unknown zone model or alpha, naming the field', () => {
    const base = { model: { id: 'hyperbolic' as const }, choice: { sensitivity: 10 }, exclusions: allOff, alternative: 'greater' as const };
    expect(() => analyseStudy([], { ...base, zoneModel: 'cubic' as never })).toThrow(/zoneModel/);
    expect(() => analyseStudy([], { ...base, alpha: 0 })).toThrow(/alpha/);
  });
});

describe('TSDoc examples', () => {
  it('hold as written', () => {
    expect(reversalTests([], { alternative: 'greater' }).signTest.pValue).toBe(1);
    expect(compareModels([]).models.length).toBe(0);
    expect(participantChoices({ participantId: 'P1', calibration: [], pairs: [], attentionCheck: 'passed', estimateFlag: null }).stage2.length).toBe(0);
    expect(applyExclusions([], { attentionCheck: true, flaggedEstimates: false, incompleteBlocks: true, responseTimeFloor: { enabled: false, ms: 0 } }).kept.length).toBe(0);
    expect(packChoices([{ soonerAmount: 5, soonerDelay: 0, soonerMagnitude: 'small', laterAmount: 10, laterDelay: 7, laterMagnitude: 'small', later: true }]).n).toBe(1);
    const fit = fitModel([{ soonerAmount: 5, soonerDelay: 0, soonerMagnitude: 'small', laterAmount: 10, laterDelay: 7, laterMagnitude: 'small', later: true }], { model: { id: 'hyperbolic' }, choice: { sensitivity: 10 } });
    expect(fit.parameterCount).toBe(2);
  });
});
