import { describe, expect, it } from 'vitest';
import { discountFactor, DesignInputError, type ModelSpec } from '@/lib/design';

// Expected values below are computed in the test by direct evaluation of each model's
// defining formula (the paper is named beside each), independently of the library's code path.
const cases: { model: ModelSpec; source: string; k: number; D: number; expected: number }[] = [
  { model: { id: 'exponential' }, source: 'Samuelson (1937), Rev Econ Stud 4:155–161: exp(−kD)', k: 0.02, D: 30, expected: Math.exp(-0.6) },
  { model: { id: 'hyperbolic' }, source: 'Mazur (1987), hyperbolic 1/(1 + kD)', k: 0.02, D: 30, expected: 1 / 1.6 },
  { model: { id: 'hyperboloid', sensitivity: 0.6 }, source: 'Myerson & Green (1995), J Exp Anal Behav 64:263–276: (1 + kD)^−s', k: 0.02, D: 30, expected: 1.6 ** -0.6 },
  { model: { id: 'power-delay', sensitivity: 0.6 }, source: 'Rachlin (2006), J Exp Anal Behav 85:425–435: 1/(1 + kD^s)', k: 0.02, D: 30, expected: 1 / (1 + 0.02 * 30 ** 0.6) },
  { model: { id: 'exponential-power', sensitivity: 0.6 }, source: 'Ebert & Prelec (2007), Manage Sci 53:1423–1438: exp(−kD^s)', k: 0.02, D: 30, expected: Math.exp(-0.02 * 30 ** 0.6) },
  { model: { id: 'quasi-hyperbolic', presentBias: 0.7 }, source: 'Laibson (1997), Q J Econ 112:443–477: β·exp(−kD) for D > 0', k: 0.02, D: 30, expected: 0.7 * Math.exp(-0.6) },
];

describe('discount factor of each published model', () => {
  for (const c of cases) {
    it(`${c.model.id} matches its defining formula (${c.source}, direct evaluation)`, () => {
      // 1e-14 relative: one or two roundings in either evaluation
      expect(discountFactor(c.model, c.k, c.D)).toBeCloseTo(c.expected, 14);
    });
  }

  it('is 1 at zero delay for every model, including quasi-hyperbolic (no present bias today)', () => {
    for (const c of cases) expect(discountFactor(c.model, c.k, 0)).toBe(1);
  });

  it('falls to 0 at an infinite delay', () => {
    for (const c of cases) expect(discountFactor(c.model, c.k, Infinity)).toBe(0);
  });

  it('keeps the TSDoc example: hyperbolic k = 0.1 per day halves value at 10 days', () => {
    expect(discountFactor({ id: 'hyperbolic' }, 0.1, 10)).toBe(0.5);
  });

  it('hyperboloid with s = 1 is the hyperbolic model and exponential-power with s = 1 is the exponential model', () => {
    for (const D of [0.5, 7, 365, 9131]) {
      expect(discountFactor({ id: 'hyperboloid', sensitivity: 1 }, 0.01, D)).toBeCloseTo(discountFactor({ id: 'hyperbolic' }, 0.01, D), 15);
      expect(discountFactor({ id: 'exponential-power', sensitivity: 1 }, 0.01, D)).toBeCloseTo(discountFactor({ id: 'exponential' }, 0.01, D), 15);
    }
  });

  it('stays in (0, 1] for tiny and huge rates', () => {
    for (const c of cases) {
      const tiny = discountFactor(c.model, 1e-12, 365);
      expect(tiny).toBeGreaterThan(c.model.id === 'quasi-hyperbolic' ? 0.69 : 0.999999);
      expect(tiny).toBeLessThanOrEqual(1);
      expect(discountFactor(c.model, 1e6, 365)).toBeGreaterThanOrEqual(0);
      expect(discountFactor(c.model, 1e6, 365)).toBeLessThan(1e-3);
    }
  });
});

describe('discount factor rejects bad input with a DesignInputError naming the field', () => {
  const bad: [string, () => unknown][] = [
    ['rate', () => discountFactor({ id: 'hyperbolic' }, 0, 1)],
    ['rate', () => discountFactor({ id: 'hyperbolic' }, -1, 1)],
    ['rate', () => discountFactor({ id: 'hyperbolic' }, NaN, 1)],
    ['rate', () => discountFactor({ id: 'hyperbolic' }, Infinity, 1)],
    ['delayDays', () => discountFactor({ id: 'hyperbolic' }, 0.1, -1)],
    ['delayDays', () => discountFactor({ id: 'hyperbolic' }, 0.1, NaN)],
    ['model.id', () => discountFactor({ id: 'linear' as never }, 0.1, 1)],
    ['model.sensitivity', () => discountFactor({ id: 'hyperboloid', sensitivity: 0 }, 0.1, 1)],
    ['model.sensitivity', () => discountFactor({ id: 'hyperboloid', sensitivity: NaN }, 0.1, 1)],
    ['model.sensitivity', () => discountFactor({ id: 'hyperboloid', sensitivity: Infinity }, 0.1, 1)],
    ['model.presentBias', () => discountFactor({ id: 'quasi-hyperbolic', presentBias: 0 }, 0.1, 1)],
    ['model.presentBias', () => discountFactor({ id: 'quasi-hyperbolic', presentBias: 1.01 }, 0.1, 1)],
    ['model.presentBias', () => discountFactor({ id: 'quasi-hyperbolic', presentBias: NaN }, 0.1, 1)],
    ['model', () => discountFactor(null as never, 0.1, 1)],
  ];
  for (const [field, call] of bad) {
    it(`throws for a bad ${field}`, () => {
      try {
        call();
        expect.unreachable('should have thrown');
      } catch (error) {
        expect(error).toBeInstanceOf(DesignInputError);
        expect((error as DesignInputError).field).toBe(field);
        expect((error as Error).message).toContain(field);
      }
    });
  }
});
