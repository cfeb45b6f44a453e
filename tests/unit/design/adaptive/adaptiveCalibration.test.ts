import { describe, expect, it } from 'vitest';
import {
  AdaptiveCalibration,
  adaptiveStep,
  calibrationCandidates,
  DesignInputError,
  posteriorRates,
  rateGrid,
  summariseMarginal,
  type AdaptiveAnswer,
  type AdaptiveCandidate,
  type ModelSpec,
  type RatePrior,
} from '@/lib/design';
import fixture from '../fixtures/adaptive/adaptive.json';

// Reference values: tests/unit/design/fixtures/adaptive/generate.py (numpy/scipy brute force on the full
// (ln k, ln K, ln s) grid: multivariate_normal prior, expit likelihoods, mutual information in its
// Kullback–Leibler form via scipy.special.rel_entr). The code factorises the likelihood and uses the
// entropy form, so agreement checks both the factorisation and the formula (docs/mathematics.md,
// "Adaptive calibration").
type Case = {
  name: string;
  model: ModelSpec;
  prior: RatePrior;
  rateNodes: number;
  span: number;
  sensitivity: { median: number; sdLog: number; nodes: number } | null;
  gamma: number;
  candidates: AdaptiveCandidate[];
  answers: AdaptiveAnswer[];
  steps: { answered: number; weights: number[]; information: number[]; meanLogSmall: number; sdLogSmall: number; meanLogLarge: number; sdLogLarge: number }[];
};
const cases = fixture.cases as Case[];

function engineFor(c: Case): AdaptiveCalibration {
  const grid = rateGrid({ model: c.model, prior: c.prior, rateNodes: c.rateNodes, span: c.span, sensitivity: c.sensitivity ?? undefined });
  return new AdaptiveCalibration({ grid, candidates: c.candidates, choice: { sensitivity: c.gamma } });
}

describe('grid posterior and expected information gain against a scipy brute force on the full grid', () => {
  it.each(cases.map((c) => [c.name, c] as const))('%s: posterior weights after each answer agree within 1e-12 absolute', (_name, c) => {
    // weights are sums of ~10² products of exp/expit terms each exact to a few ε; 1e-12 leaves 10⁴ ε of headroom
    const engine = engineFor(c);
    c.steps.forEach((step, n) => {
      if (n > 0) engine.answer(c.answers[n - 1]);
      const got = engine.posterior();
      expect(got.length).toBe(step.weights.length);
      let worst = 0;
      step.weights.forEach((w, t) => (worst = Math.max(worst, Math.abs(got[t] - w))));
      expect(worst, `after ${n} answers`).toBeLessThan(1e-12);
    });
  });

  it.each(cases.map((c) => [c.name, c] as const))('%s: information gain of every candidate agrees within 1e-12 nats', (_name, c) => {
    // I is a difference of entropies of order ln 2 ≈ 0.69; both forms are exact to ~10² ε
    const engine = engineFor(c);
    c.steps.forEach((step, n) => {
      if (n > 0) engine.answer(c.answers[n - 1]);
      const info = engine.information();
      step.information.forEach((want, i) => {
        const asked = c.answers.slice(0, n).some((a) => a.index === i);
        if (asked) expect(info[i]).toBe(-Infinity);
        else expect(Math.abs(info[i] - want), `candidate ${i} after ${n} answers`).toBeLessThan(1e-12);
      });
    });
  });

  it.each(cases.map((c) => [c.name, c] as const))('%s: posterior mean and SD of ln k and ln K agree within 1e-10', (_name, c) => {
    const engine = engineFor(c);
    c.steps.forEach((step, n) => {
      if (n > 0) engine.answer(c.answers[n - 1]);
      const s = engine.summary();
      expect(s.small.mean).toBeCloseTo(step.meanLogSmall, 10);
      expect(s.small.sd).toBeCloseTo(step.sdLogSmall, 10);
      expect(s.large.mean).toBeCloseTo(step.meanLogLarge, 10);
      expect(s.large.sd).toBeCloseTo(step.sdLogLarge, 10);
    });
  });
});

const PRIOR: RatePrior = { medianSmall: 0.02, medianLarge: 0.008, sdLogSmall: 0.8, sdLogLarge: 0.8, correlation: 0.5 };
const candidates = calibrationCandidates({ smallAmount: 60, largeAmount: 100, minDelay: 1, maxDelay: 365, amountUnit: 0.5 });

describe('choosing the next calibration item', () => {
  it('offers at least 500 candidates by default, all distinct, amounts strictly between 0 and the later amount', () => {
    expect(candidates.length).toBeGreaterThanOrEqual(500);
    expect(new Set(candidates.map((c) => c.id)).size).toBe(candidates.length);
    for (const c of candidates) {
      expect(c.soonerAmount).toBeGreaterThan(0);
      expect(c.soonerAmount).toBeLessThan(c.laterAmount);
      expect(c.laterDelay).toBeGreaterThanOrEqual(1);
      expect(c.laterDelay).toBeLessThanOrEqual(365);
    }
  });

  it('the @example counts 640 candidates', () => {
    expect(calibrationCandidates({ smallAmount: 40, largeAmount: 100, minDelay: 7, maxDelay: 365 }).length).toBe(640);
  });

  it('picks the candidate of largest information, never one already answered', () => {
    const engine = new AdaptiveCalibration({ grid: rateGrid({ model: { id: 'hyperbolic' }, prior: PRIOR }), candidates, choice: { sensitivity: 10 } });
    const asked = new Set<number>();
    for (let n = 0; n < 8; n++) {
      const info = engine.information();
      const next = engine.choose({ seed: 3 })!;
      expect(next.information).toBe(Math.max(...info));
      expect(asked.has(next.index)).toBe(false);
      asked.add(next.index);
      engine.answer({ index: next.index, choice: n % 2 ? 'LL' : 'SS' });
    }
  });

  it('is deterministic: the same seed and answers give the same items, and ties are broken by the seed', () => {
    const run = (seed: number) => {
      const engine = new AdaptiveCalibration({ grid: rateGrid({ model: { id: 'hyperbolic' }, prior: PRIOR }), candidates, choice: { sensitivity: 10 } });
      const ids: string[] = [];
      for (let n = 0; n < 6; n++) {
        const next = engine.choose({ seed })!;
        ids.push(next.candidate.id);
        engine.answer({ index: next.index, choice: n === 2 ? 'LL' : 'SS' });
      }
      return ids;
    };
    expect(run(5)).toEqual(run(5));
    // a candidate set of two identical items is an exact tie: the seed decides, and different seeds pick both
    const twin: AdaptiveCandidate[] = [0, 1].map((i) => ({ id: `t${i}`, magnitude: 'small', soonerAmount: 30, soonerDelay: 0, laterAmount: 60, laterDelay: 30 }));
    const picks = new Set<number>();
    for (let seed = 0; seed < 20; seed++) {
      const engine = new AdaptiveCalibration({ grid: rateGrid({ model: { id: 'hyperbolic' }, prior: PRIOR }), candidates: twin, choice: { sensitivity: 10 } });
      const a = engine.choose({ seed })!.index;
      expect(engine.choose({ seed })!.index).toBe(a);
      picks.add(a);
    }
    expect(picks).toEqual(new Set([0, 1]));
  });

  it('answers SS to an item moves the estimate of k up, and LL moves it down', () => {
    const engine = new AdaptiveCalibration({ grid: rateGrid({ model: { id: 'hyperbolic' }, prior: PRIOR }), candidates, choice: { sensitivity: 10 } });
    const before = engine.summary().small.median;
    const next = engine.choose({ seed: 1 })!;
    const index = candidates.findIndex((c) => c.magnitude === 'small' && c.laterDelay > 20 && c.soonerAmount / c.laterAmount > 0.45);
    engine.answer({ index, choice: 'SS' });
    expect(engine.summary().small.median).toBeGreaterThan(before);
    engine.reset();
    engine.answer({ index, choice: 'LL' });
    expect(engine.summary().small.median).toBeLessThan(before);
    expect(next.information).toBeGreaterThan(0);
  });
});

describe('stopping and the estimates handed to stage 2', () => {
  const engine = new AdaptiveCalibration({ grid: rateGrid({ model: { id: 'hyperboloid', sensitivity: 0.8 }, prior: PRIOR }), candidates, choice: { sensitivity: 10 } });
  const answersFor = (count: number, k: number, K: number): AdaptiveAnswer[] => {
    // a noiseless chooser with rates k and K (hyperboloid s = 0.8) answers each chosen item in turn
    const answers: AdaptiveAnswer[] = [];
    for (let n = 0; n < count; n++) {
      const step = adaptiveStep(engine, { answers, seed: 9, stop: { maxItems: count + 1, targetSd: 0 } });
      const c = step.next!.candidate;
      const rate = c.magnitude === 'small' ? k : K;
      answers.push({ index: step.next!.index, choice: Math.pow(1 + rate * c.laterDelay, -0.8) > c.soonerAmount / c.laterAmount ? 'LL' : 'SS' });
    }
    return answers;
  };

  it('stops after maxItems answers', () => {
    const answers = answersFor(5, 0.03, 0.01);
    const step = adaptiveStep(engine, { answers, seed: 9, stop: { maxItems: 5, targetSd: 0 } });
    expect(step).toMatchObject({ done: true, reason: 'max-items', next: null, answered: 5 });
  });

  it('stops once the posterior SD of ln k and ln K is at most the target, and not before', () => {
    const answers = answersFor(14, 0.03, 0.01);
    const sds = answers.map((_, n) => {
      const s = adaptiveStep(engine, { answers: answers.slice(0, n), seed: 9, stop: { maxItems: 40, targetSd: 0 } }).summary;
      return Math.max(s.small.sd, s.large.sd);
    });
    const target = sds[10];
    const first = sds.findIndex((sd) => sd <= target);
    const step = adaptiveStep(engine, { answers: answers.slice(0, first), seed: 9, stop: { maxItems: 40, targetSd: target } });
    expect(step).toMatchObject({ done: true, reason: 'target-sd' });
    if (first > 0) expect(adaptiveStep(engine, { answers: answers.slice(0, first - 1), seed: 9, stop: { maxItems: 40, targetSd: target } }).done).toBe(false);
  });

  it('a noiseless chooser is located: posterior intervals contain the true rates after 14 items, and narrow', () => {
    const answers = answersFor(14, 0.03, 0.01);
    const step = adaptiveStep(engine, { answers, seed: 9, stop: { maxItems: 14, targetSd: 0 } });
    const rates = posteriorRates(step.summary);
    expect(rates.kSmall.interval.lower).toBeLessThan(0.03);
    expect(rates.kSmall.interval.upper).toBeGreaterThan(0.03);
    expect(rates.kLarge.interval.lower).toBeLessThan(0.01);
    expect(rates.kLarge.interval.upper).toBeGreaterThan(0.01);
    // measured 0.55 of the prior SD: with s unknown (10 nodes of ln s) k and s trade off, so 14 items narrow k less than under a model without s
    expect(rates.kSmall.standardErrorLog).toBeLessThan(0.6 * PRIOR.sdLogSmall);
    expect(rates.kSmall.rate).toBeCloseTo(Math.exp(step.summary.small.median), 12);
    expect(rates.sensitivity).not.toBeNull();
  });

  it('replaying the same answers gives the same step (idempotent per participant and step)', () => {
    const answers = answersFor(6, 0.05, 0.004);
    const a = adaptiveStep(engine, { answers, seed: 4, stop: { maxItems: 12, targetSd: 0.2 } });
    const b = adaptiveStep(engine, { answers: answers.slice(), seed: 4, stop: { maxItems: 12, targetSd: 0.2 } });
    expect(b.next?.candidate.id).toBe(a.next?.candidate.id);
    expect(b.summary).toEqual(a.summary);
  });
});

describe('marginal summaries', () => {
  it('read quantiles from cells around the nodes: a point mass on one node has its median at that node', () => {
    const x = Float64Array.of(0, 1, 2, 3);
    expect(summariseMarginal(x, Float64Array.of(0, 1, 0, 0))).toMatchObject({ median: 1, mean: 1, sd: 0, lower: 0.525, upper: 1.475 });
    // equal weights: uniform over [−½, 3½], so the median is 1.5 and the 2.5 % quantile −0.4
    const even = summariseMarginal(x, Float64Array.of(0.25, 0.25, 0.25, 0.25));
    expect(even.median).toBeCloseTo(1.5, 14);
    expect(even.lower).toBeCloseTo(-0.4, 14);
  });
});

describe('bad input throws DesignInputError naming the field', () => {
  const grid = rateGrid({ model: { id: 'hyperbolic' }, prior: PRIOR, rateNodes: 5 });
  const engine = new AdaptiveCalibration({ grid, candidates: candidates.slice(0, 4), choice: { sensitivity: 10 } });
  const rows: [string, () => unknown][] = [
    ['rateNodes', () => rateGrid({ model: { id: 'hyperbolic' }, prior: PRIOR, rateNodes: 4 })],
    ['span', () => rateGrid({ model: { id: 'hyperbolic' }, prior: PRIOR, span: 9 })],
    ['prior.sdLogSmall', () => rateGrid({ model: { id: 'hyperbolic' }, prior: { ...PRIOR, sdLogSmall: -1 } })],
    ['sensitivity.sdLog', () => rateGrid({ model: { id: 'hyperboloid' }, prior: PRIOR, sensitivity: { sdLog: 0 } })],
    ['sensitivity.nodes', () => rateGrid({ model: { id: 'power-delay' }, prior: PRIOR, sensitivity: { nodes: 1 } })],
    ['candidates', () => new AdaptiveCalibration({ grid, candidates: [], choice: { sensitivity: 10 } })],
    ['candidates[0].soonerAmount', () => new AdaptiveCalibration({ grid, candidates: [{ ...candidates[0], soonerAmount: 100 }], choice: { sensitivity: 10 } })],
    ['choice.sensitivity', () => new AdaptiveCalibration({ grid, candidates, choice: { sensitivity: 0 } })],
    ['answer.index', () => engine.answer({ index: 4, choice: 'SS' })],
    ['answer.choice', () => engine.answer({ index: 0, choice: 'later' as never })],
    ['seed', () => engine.choose({ seed: 0.5 })],
    ['stop.maxItems', () => adaptiveStep(engine, { answers: [], seed: 1, stop: { maxItems: 0, targetSd: 0.3 } })],
    ['stop.targetSd', () => adaptiveStep(engine, { answers: [], seed: 1, stop: { maxItems: 3, targetSd: -1 } })],
    ['answers', () => adaptiveStep(engine, { answers: [{ index: 0, choice: 'SS' }, { index: 1, choice: 'SS' }], seed: 1, stop: { maxItems: 1, targetSd: 0 } })],
    ['smallAmount', () => calibrationCandidates({ smallAmount: 0, largeAmount: 100, minDelay: 1, maxDelay: 30 })],
    ['maxDelay', () => calibrationCandidates({ smallAmount: 10, largeAmount: 100, minDelay: 10, maxDelay: 5 })],
    ['delayCount', () => calibrationCandidates({ smallAmount: 10, largeAmount: 100, minDelay: 1, maxDelay: 5, delayCount: 1 })],
  ];
  it.each(rows)('bad input: %s', (field, call) => {
    expect(call).toThrow(DesignInputError);
    try {
      call();
    } catch (error) {
      expect((error as DesignInputError).field).toBe(field);
    }
  });

  it('an answer already given is refused', () => {
    const e = new AdaptiveCalibration({ grid, candidates: candidates.slice(0, 4), choice: { sensitivity: 10 } });
    e.answer({ index: 1, choice: 'LL' });
    expect(() => e.answer({ index: 1, choice: 'SS' })).toThrow(/answer.index/);
  });
});
