import { describe, expect, it } from 'vitest';
import * as design from '@/lib/design';
import * as criteria from '@/lib/criteria';
import { DesignInputError, type ModelSpec } from '@/lib/design';

// Every field of every public function: a valid call, then one field at a time replaced by
// NaN, ±Infinity and out-of-range values. Each must throw DesignInputError naming that field.

type Case = { name: string; valid: Record<string, unknown>; call: (a: Record<string, unknown>) => unknown; bad: Record<string, unknown[]> };

const nonFinite = [NaN, Infinity, -Infinity];
const rate = [0, -1e-3, ...nonFinite];
const delay = [-1, ...nonFinite];
const model: ModelSpec = { id: 'hyperboloid', sensitivity: 0.8 };
const modelBad = { 'model.id': ['nope', undefined], 'model.sensitivity': [0, -1, ...nonFinite], 'model.presentBias': [0, 1.5, -0.5, ...nonFinite] };
const pair = { model, ratio: 0.5, soonDelay: 10, kSmall: 0.1, kLarge: 0.02 };
const pairBad = { ...modelBad, ratio: [0, 1, -0.5, 1.5, ...nonFinite], soonDelay: delay, kSmall: rate, kLarge: rate };
const prior = { medianSmall: 0.02, medianLarge: 0.01, sdLogSmall: 0.5, sdLogLarge: 0.5, correlation: 0.3 };
const priorBad = {
  'prior.medianSmall': rate,
  'prior.medianLarge': rate,
  'prior.sdLogSmall': [-0.1, ...nonFinite],
  'prior.sdLogLarge': [-0.1, ...nonFinite],
  'prior.correlation': [-1.01, 1.01, ...nonFinite],
};
const onePoint = { kSmall: new Float64Array([0.1]), kLarge: new Float64Array([0.02]), weights: null };
const items = design.calibrationItems({ model: { id: 'hyperbolic' }, countPerMagnitude: 2 });

const cases: Case[] = [
  { name: 'discountFactor', valid: { model, rate: 0.1, delayDays: 3 }, call: (a) => design.discountFactor(a.model as ModelSpec, a.rate as number, a.delayDays as number), bad: { ...modelBad, rate, delayDays: [-1, NaN, -Infinity] } },
  { name: 'preferenceGaps', valid: { ...pair, lateDelay: 40 }, call: (a) => design.preferenceGaps(a as never), bad: { ...pairBad, lateDelay: [10, 5, NaN, -Infinity] } },
  { name: 'predictPattern', valid: { ...pair, lateDelay: 40 }, call: (a) => design.predictPattern(a as never), bad: { ...pairBad, lateDelay: [10, NaN, -Infinity] } },
  { name: 'reversalZone', valid: pair, call: (a) => design.reversalZone(a as never), bad: pairBad },
  { name: 'optimiseLateDelay', valid: pair, call: (a) => design.optimiseLateDelay(a as never), bad: pairBad },
  {
    name: 'anchorDelays',
    valid: { ...pair, maxFactor: 3, target: 0.001 },
    call: ({ maxFactor, target, ...p }) => design.anchorDelays(p as never, { maxFactor: maxFactor as number, target: target as number }),
    bad: { ...pairBad, maxFactor: [1, 0, ...nonFinite], target: [0, -1, ...nonFinite] },
  },
  { name: 'findRoot', valid: { lower: -1, upper: 1, tolerance: 1e-10 }, call: (a) => design.findRoot((x) => x, a as never), bad: { lower: nonFinite, upper: [-2, ...nonFinite], tolerance: [0, -1, NaN] } },
  { name: 'maximiseBrent', valid: { lower: -1, upper: 1, tolerance: 1e-10 }, call: (a) => design.maximiseBrent((x) => -x * x, a as never), bad: { lower: nonFinite, upper: [-2, ...nonFinite], tolerance: [0, -1, NaN] } },
  { name: 'createRandom', valid: { seed: 1 }, call: (a) => design.createRandom(a as never), bad: { seed: [0.5, ...nonFinite] } },
  { name: 'gaussHermite', valid: { count: 4 }, call: (a) => design.gaussHermite(a as never), bad: { count: [0, 201, 2.5, ...nonFinite] } },
  {
    name: 'priorPoints (Monte Carlo)',
    valid: { prior, count: 10, random: design.createRandom({ seed: 1 }) },
    call: (a) => design.priorPoints(a.prior as never, { method: 'monte-carlo', count: a.count as number, random: a.random as never }),
    bad: { ...priorBad, count: [0, 1.5, ...nonFinite], random: [undefined, {}] },
  },
  {
    name: 'priorPoints (quadrature)',
    valid: { prior, method: 'quadrature', nodes: 4 },
    call: (a) => design.priorPoints(a.prior as never, { method: a.method as 'quadrature', nodes: a.nodes as number }),
    bad: { ...priorBad, method: ['grid', undefined], count: [], nodes: [0, 1000, ...nonFinite] },
  },
  {
    name: 'reversibleShare',
    valid: { prior, model, ratio: 0.5, soonDelay: 7, nodes: 16 },
    call: ({ prior: p, ...o }) => design.reversibleShare(p as never, o as never),
    bad: { ...priorBad, ...modelBad, ratio: [0, 1, ...nonFinite], soonDelay: delay, nodes: [0, 500, ...nonFinite] },
  },
  {
    name: 'choiceProbability',
    valid: { choice: { sensitivity: 5, lapse: 0.1 }, valueGap: 0.1 },
    call: (a) => design.choiceProbability(a.choice as never, a.valueGap as number),
    bad: { 'choice.sensitivity': [0, -1, ...nonFinite], 'choice.lapse': [1, -0.1, ...nonFinite], valueGap: [NaN] },
  },
  {
    name: 'indifferenceRate',
    valid: { model, soonerAmount: 40, soonerDelay: 0, laterAmount: 100, laterDelay: 30 },
    call: ({ model: m, ...item }) => design.indifferenceRate(m as never, item as never),
    bad: { ...modelBad, soonerAmount: [0, -1, 100, 150, ...nonFinite], laterAmount: [0, -1, ...nonFinite], soonerDelay: delay, laterDelay: [-1, NaN, Infinity, -Infinity] },
  },
  {
    name: 'calibrationItems',
    valid: { model, countPerMagnitude: 3, delayRange: { min: 1, max: 30 }, rateRange: { min: 1e-3, max: 0.1 }, amounts: { small: 10, large: 100 }, roundTo: 0.5 },
    call: (a) => design.calibrationItems(a as never),
    bad: {
      ...modelBad,
      countPerMagnitude: [1, 2.5, ...nonFinite],
      'delayRange.min': [0, -1, ...nonFinite],
      'delayRange.max': [0.5, ...nonFinite],
      'rateRange.min': [0, ...nonFinite],
      'rateRange.max': [1e-4, ...nonFinite],
      'amounts.small': [0, ...nonFinite],
      'amounts.large': [0, ...nonFinite],
      roundTo: [-1, 50, NaN, Infinity],
    },
  },
  {
    name: 'extrapolationWarning',
    valid: { calibrationDelays: [7, 30], probeDelays: [60], factor: 3 },
    call: (a) => design.extrapolationWarning(a as never),
    bad: { 'calibrationDelays[0]': [0, -1, ...nonFinite], 'probeDelays[0]': [0, ...nonFinite], factor: [0.5, ...nonFinite] },
  },
  {
    name: 'estimateRates',
    valid: { model: { id: 'hyperbolic' }, sensitivity: 10, lapse: 0, consistencyThreshold: 0.75 },
    call: ({ model: m, ...o }) => design.estimateRates(['LL', 'SS', 'LL', 'SS'], items, m as never, o),
    bad: { 'model.id': ['nope'], 'model.sensitivity': [0, NaN], sensitivity: [0, -1, ...nonFinite], lapse: [1, -0.1, ...nonFinite], consistencyThreshold: [-0.1, 1.1, ...nonFinite] },
  },
  { name: 'fitPrior', valid: { 'rows': [1, 2, 3].map(() => ({ kSmall: 0.1, kLarge: 0.01 })) }, call: (a) => design.fitPrior(a.rows as never), bad: { 'rows[0].kSmall': rate, 'rows[2].kLarge': rate } },
  { name: 'gapProduct', valid: { ...pair, lateDelay: 40 }, call: (a) => criteria.gapProduct(a as never), bad: { ...pairBad, lateDelay: [10, NaN, -Infinity] } },
  {
    name: 'expectedReversalRate',
    valid: { model, ratio: 0.5, soonDelay: 10, lateDelay: 40, choice: { sensitivity: 10, lapse: 0 }, points: onePoint },
    call: (a) => criteria.expectedReversalRate(a as never),
    bad: { ...modelBad, ratio: [0, 1, ...nonFinite], soonDelay: delay, lateDelay: [10, NaN, -Infinity], 'choice.sensitivity': [0, ...nonFinite], 'choice.lapse': [1, ...nonFinite], points: [null, { kSmall: [0.1], kLarge: [0.1], weights: null }] },
  },
  {
    name: 'maximinGap',
    valid: { model, ratio: 0.5, soonDelay: 10, lateDelay: 40, scenarios: [{ kSmall: 0.1, kLarge: 0.02 }] },
    call: (a) => criteria.maximinGap(a as never),
    bad: { ...modelBad, ratio: [0, 1, ...nonFinite], soonDelay: delay, lateDelay: [10, NaN], 'scenarios[0].kSmall': rate, 'scenarios[0].kLarge': rate, scenarios: [[]] },
  },
  {
    name: 'priorScenarios',
    valid: { prior, radius: 1, count: 4 },
    call: ({ prior: p, ...o }) => criteria.priorScenarios(p as never, o),
    bad: { ...priorBad, radius: [-1, ...nonFinite], count: [0, 1.5, ...nonFinite] },
  },
];

function withField(valid: Record<string, unknown>, path: string, value: unknown): Record<string, unknown> {
  const copy = structuredClone({ ...valid, random: undefined, points: undefined }) as Record<string, unknown>;
  if ('random' in valid) copy.random = valid.random;
  if ('points' in valid) copy.points = valid.points;
  const keys = path.replace(/\[(\d+)\]/g, '.$1').split('.');
  let at = copy as Record<string, unknown>;
  for (const k of keys.slice(0, -1)) at = at[k] as Record<string, unknown>;
  at[keys[keys.length - 1]] = value;
  return copy;
}

// names of fields as errors report them: rows[i] of fitPrior are reported as estimates[i]
const reported = (name: string, path: string) => (name === 'fitPrior' ? path.replace('rows', 'estimates') : path);

describe('bad input throws DesignInputError naming the field', () => {
  for (const c of cases) {
    it(`${c.name}: the valid call succeeds`, () => {
      expect(() => c.call(withField(c.valid, Object.keys(c.valid)[0], Object.values(c.valid)[0]))).not.toThrow();
    });
    for (const [path, values] of Object.entries(c.bad)) {
      for (const value of values) {
        it(`${c.name}: ${path} = ${Array.isArray(value) ? '[]' : typeof value === 'object' && value !== null ? 'object' : String(value)}`, () => {
          try {
            c.call(withField(c.valid, path, value));
            expect.unreachable('should have thrown');
          } catch (error) {
            expect(error).toBeInstanceOf(DesignInputError);
            const field = (error as DesignInputError).field;
            expect(field === reported(c.name, path) || (path === 'model.id' && field === 'model.id')).toBe(true);
            expect((error as Error).message.startsWith(field)).toBe(true);
          }
        });
      }
    }
  }
});

describe('the error type', () => {
  it('keeps the TSDoc example: the field is carried on the error', () => {
    const e = new DesignInputError('ratio', 'a number strictly between 0 and 1', 1.2);
    expect(e.field).toBe('ratio');
    expect(e.message).toBe('ratio must be a number strictly between 0 and 1 (received 1.2)');
    expect(e).toBeInstanceOf(Error);
  });
});
