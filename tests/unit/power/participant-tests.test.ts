import { describe, expect, it } from 'vitest';
import binomialCdf from '@stdlib/stats-base-dists-binomial-cdf';
import binomialTest from '@stdlib/stats-binomial-test';
import { createPowerSimulator, createRandom, mcnemarExactTest, methodText, signFlipTest, signTest, summarisePower, type PowerScenario, type PowerTestKind } from '@/lib/design';
import fixture from '../../fixtures/power/sign_flip.json';

describe('sign-flip permutation test at the participant level', () => {
  it('matches exact p-values of an independent library for every fixture case', () => {
    // reference: scipy.stats.permutation_test, every sign pattern enumerated (tests/fixtures/power/sign_flip.py);
    // sums of at most 2^14 halvings of dyadic numbers: 1e-12 absolute is honest
    expect(fixture.cases.length).toBeGreaterThan(60);
    for (const c of fixture.cases) {
      for (const alternative of ['greater', 'less', 'two-sided'] as const) {
        expect(Math.abs(signFlipTest({ scores: c.scores, alternative }).pValue - c[alternative])).toBeLessThan(1e-12);
      }
    }
  });

  it('gives 3/16 for the documented example (exact arithmetic: 3 of the 16 sign patterns of 2, 1, 3, −1 sum to 5 or more)', () => {
    expect(signFlipTest({ scores: [2, 1, 3, -1], alternative: 'greater' })).toEqual({ statistic: 5, pValue: 3 / 16 });
  });

  it('is the sign test when every participant has one probe pair (scores −1, 0, 1)', () => {
    // closed form: with scores in {−1, 0, 1}, Σ scores = (#positive) − (#negative) and its sign-flip
    // distribution is 2·Binomial(#positive + #negative, 1/2) − (#positive + #negative), so both p-values are
    // the same binomial tail; second opinion on the tail: @stdlib/stats-binomial-test
    for (const [pos, neg, zero] of [[9, 1, 3], [12, 12, 0], [30, 18, 5], [3, 7, 0]]) {
      const scores = [...Array(pos).fill(1), ...Array(neg).fill(-1), ...Array(zero).fill(0)];
      for (const alternative of ['greater', 'two-sided'] as const) {
        const p = signFlipTest({ scores, alternative }).pValue;
        expect(p).toBeCloseTo(signTest(pos, neg, alternative).pValue, 12);
        expect(p).toBeCloseTo(binomialTest(pos, pos + neg, { p: 0.5, alternative }).pValue, 12);
      }
    }
  });

  it('names the field of bad input', () => {
    expect(() => signFlipTest({ scores: [1, 0.5], alternative: 'greater' })).toThrow(/scores\[1\]/);
    expect(() => signFlipTest({ scores: [1], alternative: 'bigger' as never })).toThrow(/alternative/);
  });
});

describe('type I error with four correlated probe pairs per participant', () => {
  // A null truth with clustering: each participant leans towards LS or towards SL (probability 0.85 of
  // the leaning pattern for each discordant probe, leaning side a fair coin), so LS and SL are equally
  // likely in the population while a person's four probe pairs are strongly correlated.
  const R = 2000; // replicates, stated for the acceptance band below
  const N = 30;
  const PROBES = 4;
  const ALPHA = 0.05;
  // acceptance band: a valid test rejects in at most Binomial(R, α) replicates; its 0.999 quantile
  // (from @stdlib/stats-base-dists-binomial-cdf) bounds chance excursions above nominal α
  let bound = 0;
  while (binomialCdf(bound, R, ALPHA) < 0.999) bound++;

  const rejections = { pooled: 0, sign: 0, signFlip: 0 };
  const random = createRandom({ seed: 15 });
  for (let r = 0; r < R; r++) {
    let b = 0;
    let c = 0;
    let positive = 0;
    let negative = 0;
    const scores: number[] = [];
    for (let i = 0; i < N; i++) {
      const lean = random.uniform() < 0.5 ? 0.85 : 0.15;
      let ls = 0;
      let sl = 0;
      for (let j = 0; j < PROBES; j++) {
        if (random.uniform() >= 0.5) continue; // concordant pair (LL or SS)
        if (random.uniform() < lean) ls++;
        else sl++;
      }
      b += ls;
      c += sl;
      if (ls > sl) positive++;
      else if (ls < sl) negative++;
      scores.push(ls - sl);
    }
    if (mcnemarExactTest(b, c, 'greater').pValue < ALPHA) rejections.pooled++;
    if (signTest(positive, negative, 'greater').pValue < ALPHA) rejections.sign++;
    if (signFlipTest({ scores, alternative: 'greater' }).pValue < ALPHA) rejections.signFlip++;
  }

  it('is above nominal α for the pooled McNemar test, beyond the binomial acceptance band', () => {
    expect(bound).toBe(131); // 0.999 quantile of Binomial(2000, 0.05) (scipy.stats.binom.ppf agrees): 6.55 % of replicates
    expect(rejections.pooled).toBeGreaterThan(bound);
    // on this seed it is 9.9 %, about twice nominal: well above the band, not a near miss
    expect(rejections.pooled / R).toBeGreaterThan(0.09);
  });

  it('stays within the band for the participant-level sign test and sign-flip test', () => {
    expect(rejections.sign).toBeLessThanOrEqual(bound);
    expect(rejections.signFlip).toBeLessThanOrEqual(bound);
  });
});

describe('participant-level power with one probe pair per participant', () => {
  const prior = { medianSmall: 0.02, medianLarge: 0.008, sdLogSmall: 1, sdLogLarge: 1, correlation: 0.8 };
  const spec = {
    model: { id: 'hyperbolic' as const },
    ratio: 0.82,
    largeAmount: 100,
    currency: 'EUR',
    mode: 'personalised' as const,
    soonDelay: { mode: 'fixed' as const, days: 30 },
    lateDelayLimit: 9131,
    probePairs: 1,
    lateAnchors: 1,
    soonAnchors: 1,
    calibration: { itemsPerMagnitude: 12, minDelay: 1, maxDelay: 365 },
  };
  const scenario = (kind: PowerTestKind): PowerScenario => ({
    design: { spec, prior, soonDelay: 30 },
    truth: { model: { id: 'hyperbolic' }, prior, gamma: 10, lapse: 0.02 },
    calibration: 'simulated',
    test: { kind, alpha: 0.05, alternative: 'greater' },
    sampleSizes: [4, 8, 16, 32],
    replications: 150,
    seed: 3,
  });

  it('equals the pooled McNemar power replicate by replicate', () => {
    // closed form: with one probe pair per person, b (LS pairs) is the number of participants with
    // LS − SL = 1 and c the number with −1, so McNemar's b-of-(b + c) binomial test, the sign test on
    // participants and the sign-flip test on scores in {−1, 0, 1} give the same p-value in every
    // replicate; the choices do not depend on the test, so the same seed gives the same rejections
    const mcnemar = createPowerSimulator(scenario('mcnemar')).run(0, 150);
    const sign = createPowerSimulator(scenario('sign')).run(0, 150);
    const flip = createPowerSimulator(scenario('sign-flip')).run(0, 150);
    expect(sign.rejections).toEqual(mcnemar.rejections);
    expect(flip.rejections).toEqual(mcnemar.rejections);
    expect(mcnemar.rejections[3]).toBeGreaterThan(0); // not a vacuous comparison
  });

  it('warns in the method paragraph that the pooled test assumes independent pairs, and names the sign-flip test\'s sources', () => {
    const context = { software: 'Switchback test', designLabel: 'One probe', designHash: 'abc' };
    const text = (kind: PowerTestKind) => {
      const s = scenario(kind);
      return methodText(s, summarisePower(s, createPowerSimulator(s).run(0, 20), null), context);
    };
    expect(text('mcnemar')).toMatch(/assumes that every probe pair is independent/);
    expect(text('sign-flip')).toMatch(/sign-flip permutation test at the participant level \(Fisher 1935; Pitman 1937\)/);
    expect(text('sign')).not.toMatch(/every probe pair is independent/);
  });
});

describe('what a reader is told about the test', () => {
  it('labels the pooled McNemar test as assuming independent pairs, on the page, the figure and in the method paragraph', async () => {
    const { POWER_TEST_LABELS, DEFAULT_POWER_TEST, testWarning } = await import('@/lib/shared/validations/power');
    expect(DEFAULT_POWER_TEST).toBe('sign');
    expect(POWER_TEST_LABELS.mcnemar).toMatch(/assumes independent pairs/);
    expect(testWarning('mcnemar')).toMatch(/assumes independent pairs/);
    expect(testWarning('sign')).toBeNull();
    expect(testWarning('sign-flip')).toBeNull();
  });
});
