import { quantileSorted } from 'd3-array';
import jstatModule from 'jstat';
import { describe, expect, it } from 'vitest';
import { createRandom, DEFAULT_CHOICE_SENSITIVITY, discountFactor, MODEL_IDS, reversalZone, type ModelSpec } from '@/lib/design';
import { defaultSpec } from '@/lib/shared/planner/design-form-values';
import { priorDraws } from '@/lib/shared/planner/points';
import { priorView } from '@/lib/shared/planner/prior-view';
import { computeDesignSummary } from '@/lib/shared/planner/summary';
import type { PlannerInput } from '@/lib/shared/planner/types';
import type { DesignSpec, PriorValues } from '@/lib/shared/validations/planner';

const { jStat } = jstatModule as unknown as {
  jStat: { normal: { cdf: (x: number, m: number, s: number) => number; sample: (m: number, s: number) => number }; setRandom: (fn: () => number) => void };
};

const prior: PriorValues = { medianSmall: 0.02, medianLarge: 0.008, sdLogSmall: 0.8, sdLogLarge: 0.8, correlation: 0.6 };
const spec = (over: Partial<DesignSpec> = {}): PlannerInput['spec'] => ({ ...defaultSpec('Test', 1), ...over });

describe('the design page numbers', () => {
  it('put the typical participant’s zone at the hyperbolic closed form', () => {
    // D_lower = d + (1 − x)/(xK), D_upper = (1 + kd − x)/(xK) (docs/mathematics.md, "Closed forms")
    const s = computeDesignSummary({ spec: spec({ ratio: 0.6, soonDelay: { mode: 'fixed', days: 14 } }), prior });
    const [x, d, k, K] = [0.6, 14, 0.02, 0.008];
    expect(s.typical.zone!.lower).toBeCloseTo(d + (1 - x) / (x * K), 9);
    expect(s.typical.zone!.upper).toBeCloseTo((1 + k * d - x) / (x * K), 9);
    expect(s.typical.optimum!.lateDelay).toBeGreaterThan(s.typical.zone!.lower);
    expect(s.typical.optimum!.lateDelay).toBeLessThan(s.typical.zone!.upper);
  });

  it('report the hyperbolic share of the prior that can reverse as the normal probability of k > xK', () => {
    // ln k − ln K ~ N(μk − μK, σk² + σK² − 2ρσkσK); reversal possible iff k > xK (docs/mathematics.md, "Choice model" and "Closed forms"). jstat is the second opinion.
    const s = computeDesignSummary({ spec: spec({ ratio: 0.6 }), prior });
    const sd = Math.sqrt(0.64 + 0.64 - 2 * 0.6 * 0.64);
    const expected = 1 - jStat.normal.cdf(Math.log(0.6), Math.log(0.02) - Math.log(0.008), sd);
    expect(s.reversibleShare).toBeCloseTo(expected, 8); // 64-node quadrature of a smooth integrand: 1e-8 is honest
  });

  it('give pattern shares that sum to one for every pair role, with the probe mostly LS', () => {
    for (const mode of ['personalised', 'population'] as const) {
      const s = computeDesignSummary({ spec: spec({ mode, criterion: 'expected-reversal-rate' }), prior });
      for (const role of s.roles) {
        const sh = role.shares!;
        expect(sh.LL + sh.LS + sh.SL + sh.SS).toBeCloseTo(1, 12);
      }
      const [late, probe, soon] = s.roles;
      expect(probe.shares!.LS).toBeGreaterThan(late.shares!.LS);
      expect(probe.shares!.LS).toBeGreaterThan(soon.shares!.LS);
      expect(late.shares!.LL).toBeGreaterThan(late.shares!.SS);
      expect(soon.shares!.SS).toBeGreaterThan(soon.shares!.LL);
      expect(s.expectedReversalRate).toBe(probe.shares!.LS);
    }
  });

  it('give a population design’s expected reversal rate that a plain Monte Carlo average confirms (jstat normal draws)', () => {
    const s = computeDesignSummary({ spec: spec({ mode: 'population', criterion: 'expected-reversal-rate' }), prior });
    const D = s.roles[1].lateDelay!;
    const d = s.soonDelay;
    const model = { id: 'hyperbolic' as const };
    const n = 200_000;
    const sigma = (z: number) => 1 / (1 + Math.exp(-z));
    let sum = 0;
    // jstat's normal sampler, fed a seeded uniform so the draws (and the outcome) repeat run to run
    const seeded = createRandom({ seed: 20261203 });
    jStat.setRandom(() => seeded.uniform());
    for (let i = 0; i < n; i++) {
      const z1 = jStat.normal.sample(0, 1);
      const z2 = jStat.normal.sample(0, 1);
      const k = Math.exp(Math.log(0.02) + 0.8 * z1);
      const K = Math.exp(Math.log(0.008) + 0.8 * (0.6 * z1 + Math.sqrt(1 - 0.36) * z2));
      const far = discountFactor(model, K, D) - 0.6 * discountFactor(model, k, d);
      const near = 0.6 - discountFactor(model, K, D - d);
      sum += sigma(DEFAULT_CHOICE_SENSITIVITY * far) * sigma(DEFAULT_CHOICE_SENSITIVITY * near); // the γ a design without its own assumes
    }
    jStat.setRandom(Math.random);
    // standard error ≤ 0.5/√n ≈ 0.0011; 0.006 allows > 5 SE plus the 12×12 quadrature error
    expect(Math.abs(s.expectedReversalRate - sum / n)).toBeLessThan(0.006);
  });

  it('draw the value lines crossing where the two discounted values are equal', () => {
    const s = computeDesignSummary({ spec: spec({ largeAmount: 200 }), prior });
    const c = s.valueCurve!;
    const t = c.crossing!;
    const model = { id: 'hyperbolic' as const };
    const small = 0.6 * 200 * discountFactor(model, 0.02, c.soonDelay - t);
    const large = 200 * discountFactor(model, 0.008, c.lateDelay - t);
    expect(Math.abs(small - large)).toBeLessThan(1e-6);
    expect(c.large[0]).toBeGreaterThan(c.small[0]); // LL preferred in the far view
    expect(c.small[c.small.length - 1]).toBeGreaterThan(c.large[c.large.length - 1]); // SS in the near view
  });

  it('mark the gap product optimum at the top of the drawn curve', () => {
    const s = computeDesignSummary({ spec: spec(), prior });
    const g = s.gapCurve!;
    expect(Math.max(...g.values)).toBeLessThanOrEqual(g.optimum!.gapProduct * (1 + 1e-12));
    expect(Math.max(...g.values)).toBeGreaterThan(g.optimum!.gapProduct * 0.99); // 120-point grid near a smooth maximum
  });

  it('spread the zone bounds over the prior as type-7 quantiles (d3-array as the second opinion)', () => {
    const s = computeDesignSummary({ spec: spec(), prior });
    const draws = priorDraws(prior);
    const lower: number[] = [];
    for (let i = 0; i < draws.kSmall.length; i++) {
      const [k, K] = [draws.kSmall[i], draws.kLarge[i]];
      if (k > 0.6 * K) lower.push(14 + 0.4 / (0.6 * K)); // hyperbolic closed form, non-empty iff k > xK
    }
    lower.sort((a, b) => a - b);
    expect(s.boundSpread!.withZone).toBe(lower.length);
    expect(s.boundSpread!.lower!.p10).toBeCloseTo(quantileSorted(lower, 0.1)!, 6);
    expect(s.boundSpread!.lower!.p90).toBeCloseTo(quantileSorted(lower, 0.9)!, 6);
  });

  it('warn when probes reach far beyond the calibration delays, and when the soon delay is 0', () => {
    const far = computeDesignSummary({ spec: spec({ calibration: { itemsPerMagnitude: 10, minDelay: 1, maxDelay: 14 } }), prior });
    expect(far.warnings.map((w) => w.kind)).toContain('extrapolation');
    const zero = computeDesignSummary({ spec: spec({ soonDelay: { mode: 'fixed', days: 0 } }), prior });
    expect(zero.warnings.map((w) => w.kind)).toContain('empty-zone');
    expect(zero.typical.zone).toBeNull();
  });

  it('pick an optimised soon delay as a whole day within its bounds', () => {
    for (const mode of ['personalised', 'population'] as const) {
      const s = computeDesignSummary({ spec: spec({ mode, soonDelay: { mode: 'optimised', min: 5, max: 40 } }), prior });
      expect(Number.isInteger(s.soonDelay)).toBe(true);
      expect(s.soonDelay).toBeGreaterThanOrEqual(5);
      expect(s.soonDelay).toBeLessThanOrEqual(40);
    }
  });

  it('are the same numbers every time (the browser and the server agree)', () => {
    const input = { spec: spec({ model: { id: 'hyperboloid', sensitivity: 0.7 }, mode: 'population', criterion: 'maximin' }), prior };
    expect(JSON.stringify(computeDesignSummary(input))).toBe(JSON.stringify(computeDesignSummary(JSON.parse(JSON.stringify(input)))));
  });
});

describe('the prior picture', () => {
  it('draws the line where reversals become possible at K = k/x for the hyperbolic model and K = k for the exponential', () => {
    // non-empty iff k > xK (hyperbolic), k > K (exponential): docs/mathematics.md, "Closed forms"
    for (const [id, factor] of [['hyperbolic', 1 / 0.5], ['exponential', 1]] as const) {
      const view = priorView(prior, { model: { id }, ratio: 0.5, soonDelay: 7 });
      expect(view.boundary.kSmall.length).toBeGreaterThan(10);
      view.boundary.kSmall.forEach((k, i) => expect(view.boundary.kLarge[i] / (k * factor)).toBeCloseTo(1, 9));
    }
  });

  it('puts the line exactly where the zone opens, for every model', () => {
    for (const id of MODEL_IDS) {
      const model: ModelSpec = id === 'quasi-hyperbolic' ? { id, presentBias: 0.8 } : ['hyperbolic', 'exponential'].includes(id) ? { id } : { id, sensitivity: 0.8 };
      const view = priorView(prior, { model, ratio: 0.5, soonDelay: 7 });
      expect(view.boundary.kSmall.length, id).toBeGreaterThan(5);
      view.boundary.kSmall.forEach((k, i) => {
        const K = view.boundary.kLarge[i];
        expect(reversalZone({ model, ratio: 0.5, soonDelay: 7, kSmall: k, kLarge: K * (1 - 1e-6) }), `${id} just below`).not.toBeNull();
        expect(reversalZone({ model, ratio: 0.5, soonDelay: 7, kSmall: k, kLarge: K * (1 + 1e-6) }), `${id} just above`).toBeNull();
      });
    }
  });

  it('flags exactly the draws below the line as able to reverse', () => {
    const view = priorView(prior, { model: { id: 'hyperbolic' }, ratio: 0.5, soonDelay: 7 });
    for (let i = 0; i < view.draws.kSmall.length; i++) expect(view.canReverse[i]).toBe(view.draws.kSmall[i] > 0.5 * view.draws.kLarge[i] ? 1 : 0);
  });
});

describe('the accuracy of the expected reversal rates the design page shows', () => {
  it('computes them on as many quadrature nodes as the 1e-4 target needs at the design’s γ, not a fixed 12', async () => {
    const { expectationNodes } = await import('@/lib/shared/planner/points');
    const { expectedRateNodes } = await import('@/lib/criteria');
    // γ = 20 and spread 0.8: the node table (checked against fine-grid references in the criteria tests) asks for 40 per axis
    expect(expectedRateNodes({ choice: { sensitivity: 20 }, prior }).nodes).toBe(40);
    expect(expectationNodes(prior, 20).kSmall.length).toBe(40 * 40);
    const s = spec({ mode: 'population', criterion: 'expected-reversal-rate', soonDelay: { mode: 'fixed', days: 14 }, choiceSensitivity: 20 });
    const viaNodes = computeDesignSummary({ spec: s, prior }, { nodes: expectationNodes(prior, 20) });
    expect(computeDesignSummary({ spec: s, prior }).expectedReversalRate).toBe(viaNodes.expectedReversalRate);
    expect(viaNodes.warnings.some((w) => w.kind === 'accuracy')).toBe(false);
  });

  it('warns instead of claiming four decimals when γ × spread is beyond the largest rule', () => {
    const s = computeDesignSummary({ spec: spec({ choiceSensitivity: 1000, soonDelay: { mode: 'fixed', days: 14 } }), prior });
    const warning = s.warnings.find((w) => w.kind === 'accuracy');
    expect(warning?.message).toContain('may be off by more than 0.0001');
  }, 30_000);
});
