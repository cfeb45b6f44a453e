import { DesignInputError } from './DesignInputError';
import { gaussHermite } from './gaussHermite';
import type { SeededRandom } from './random';
import { checkInteger } from './validate';

/** Bivariate normal prior on (ln kSmall, ln kLarge), stated on the natural scale. */
export type RatePrior = {
  /** median discount rate for the small reward, per day (= exp of the mean of ln k) */
  medianSmall: number;
  /** median discount rate for the large reward, per day */
  medianLarge: number;
  /** standard deviation of ln kSmall (natural log), 0 or more */
  sdLogSmall: number;
  /** standard deviation of ln kLarge, 0 or more */
  sdLogLarge: number;
  /** correlation of ln kSmall and ln kLarge, −1 to 1 */
  correlation: number;
};

/**
 * Rate pairs with weights: Monte Carlo draws (weights null = equal) or quadrature nodes
 * (weights summing to 1). Every criterion that averages over a prior takes these.
 */
export type RatePoints = { kSmall: Float64Array; kLarge: Float64Array; weights: Float64Array | null };

export type PriorPointsOptions =
  | { method: 'monte-carlo'; count: number; random: SeededRandom }
  | { method: 'quadrature'; nodes?: number };

/**
 * Checks a prior: medians positive and finite (per day), log-scale SDs finite and ≥ 0,
 * correlation in [−1, 1].
 *
 * @throws DesignInputError naming `prior.<field>` for the first field out of range
 * @example checkPrior({ medianSmall: 0.02, medianLarge: 0.01, sdLogSmall: 1, sdLogLarge: 1, correlation: 2 }) // throws, field 'prior.correlation'
 */
export function checkPrior(prior: RatePrior, field = 'prior'): void {
  if (prior === null || typeof prior !== 'object') throw new DesignInputError(field, 'an object with medians, log-scale SDs and a correlation', prior);
  for (const key of ['medianSmall', 'medianLarge'] as const) {
    const v = prior[key];
    if (!(v > 0 && v < Infinity)) throw new DesignInputError(`${field}.${key}`, 'a finite rate greater than 0 (per day)', v);
  }
  for (const key of ['sdLogSmall', 'sdLogLarge'] as const) {
    const v = prior[key];
    if (!(v >= 0 && v < Infinity)) throw new DesignInputError(`${field}.${key}`, 'a finite number, 0 or more', v);
  }
  const r = prior.correlation;
  if (!(r >= -1 && r <= 1)) throw new DesignInputError(`${field}.correlation`, 'a number from −1 to 1', r);
}

/**
 * Points representing the prior: `monte-carlo` draws `count` pairs with the seeded generator
 * (ln k = μ + σ·Z with Cholesky-correlated normals); `quadrature` is the tensor Gauss–Hermite
 * rule with `nodes` points per axis (default 24; Press et al. 2007, Numerical Recipes §4.6.1),
 * mapped through the same Cholesky factor.
 *
 * @throws DesignInputError for a bad prior, count (1 to 10^7), nodes (1 to 200) or method
 * @example priorPoints({ medianSmall: 0.01, medianLarge: 0.005, sdLogSmall: 0, sdLogLarge: 0, correlation: 0 }, { method: 'quadrature', nodes: 1 }).kSmall[0] // 0.01
 */
export function priorPoints(prior: RatePrior, options: PriorPointsOptions): RatePoints {
  checkPrior(prior);
  const m1 = Math.log(prior.medianSmall);
  const m2 = Math.log(prior.medianLarge);
  const s1 = prior.sdLogSmall;
  const s2 = prior.sdLogLarge;
  const r = prior.correlation;
  const c = s2 * Math.sqrt(Math.max(0, 1 - r * r));
  if (options?.method === 'monte-carlo') {
    checkInteger('count', options.count, 1, 1e7);
    if (!options.random || typeof options.random.normal !== 'function') throw new DesignInputError('random', 'a seeded generator from createRandom', options.random);
    const n = options.count;
    const kSmall = new Float64Array(n);
    const kLarge = new Float64Array(n);
    for (let i = 0; i < n; i++) {
      const z1 = options.random.normal();
      const z2 = options.random.normal();
      kSmall[i] = Math.exp(m1 + s1 * z1);
      kLarge[i] = Math.exp(m2 + s2 * r * z1 + c * z2);
    }
    return { kSmall, kLarge, weights: null };
  }
  if (options?.method === 'quadrature') {
    const nodes = options.nodes ?? 24;
    checkInteger('nodes', nodes, 1, 200);
    const rule = gaussHermite({ count: nodes });
    const n = rule.nodes.length;
    const kSmall = new Float64Array(n * n);
    const kLarge = new Float64Array(n * n);
    const weights = new Float64Array(n * n);
    for (let i = 0; i < n; i++) {
      const z1 = Math.SQRT2 * rule.nodes[i];
      for (let j = 0; j < n; j++) {
        const z2 = Math.SQRT2 * rule.nodes[j];
        const at = i * n + j;
        kSmall[at] = Math.exp(m1 + s1 * z1);
        kLarge[at] = Math.exp(m2 + s2 * r * z1 + c * z2);
        weights[at] = (rule.weights[i] * rule.weights[j]) / Math.PI;
      }
    }
    return { kSmall, kLarge, weights };
  }
  throw new DesignInputError('method', "'monte-carlo' or 'quadrature'", (options as { method?: unknown })?.method);
}
