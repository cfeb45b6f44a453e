import { gaussHermite } from './gaussHermite';
import { normalCdf } from './normalCdf';
import { checkPrior, type RatePrior } from './ratePrior';
import { checkDelay, checkInteger, checkModel, checkRatio } from './validate';
import { zoneConstants, type ZoneConstants } from './zoneBounds';
import type { ModelSpec } from './types';

/**
 * Share of the prior's mass that can reverse: the probability that (kSmall, kLarge) has a
 * non-empty reversal zone for the given model, ratio and soon delay.
 *
 * Every model's bounds have the form D_lower = d + (a/K)^p, D_upper = (b/K)^p with a, b
 * depending on k only (zoneBounds.ts), so for fixed k the zone is non-empty exactly when
 * ln K < τ(k) = ln((b^p − a^p)/d)/p. Given ln k the prior makes ln K normal, so
 *   share = E_k[ Φ((τ(k) − E[ln K | ln k]) / SD[ln K | ln k]) ],
 * a smooth one-dimensional integral done by Gauss–Hermite quadrature over ln k
 * (Press et al. 2007, Numerical Recipes §4.6.1). For the hyperbolic model this is
 * Φ((μ_k − μ_K − ln x)/√(σ_k² + σ_K² − 2ρσ_kσ_K)) exactly (non-empty iff k > xK).
 *
 * @param options.nodes quadrature nodes, default 64
 * @throws DesignInputError for a bad prior, model, ratio, soon delay or node count
 * @example reversibleShare({ medianSmall: 0.02, medianLarge: 0.01, sdLogSmall: 1, sdLogLarge: 1, correlation: 0.5 }, { model: { id: 'exponential' }, ratio: 0.5, soonDelay: 7 }) // Φ(ln 2) ≈ 0.756
 */
export function reversibleShare(
  prior: RatePrior,
  options: { model: ModelSpec; ratio: number; soonDelay: number; nodes?: number },
): number {
  checkPrior(prior);
  const { model, ratio: x, soonDelay: d } = options;
  checkModel(model);
  checkRatio(x);
  checkDelay('soonDelay', d);
  const nodes = options.nodes ?? 64;
  checkInteger('nodes', nodes, 1, 200);
  if (d === 0) return 0;
  const rule = gaussHermite({ count: nodes });
  const m1 = Math.log(prior.medianSmall);
  const m2 = Math.log(prior.medianLarge);
  const { sdLogSmall: s1, sdLogLarge: s2, correlation: r } = prior;
  const sdCond = s2 * Math.sqrt(Math.max(0, 1 - r * r));
  const s = model.sensitivity ?? 1;
  const beta = model.presentBias ?? 1;
  const c: ZoneConstants = { a: 0, b: 0, p: 1, span: 0 };
  let share = 0;
  for (let i = 0; i < rule.nodes.length; i++) {
    const z = Math.SQRT2 * rule.nodes[i];
    const k = Math.exp(m1 + s1 * z);
    zoneConstants(model.id, x, d, k, s, beta, c);
    const width = c.p === 1 ? c.span : Math.pow(c.b, c.p) - Math.pow(c.a, c.p);
    if (!(width > 0)) continue;
    const tau = Math.log(width / d) / c.p;
    const mean = m2 + s2 * r * z;
    const prob = sdCond > 0 ? normalCdf((tau - mean) / sdCond) : tau > mean ? 1 : 0;
    share += (rule.weights[i] / Math.sqrt(Math.PI)) * prob;
  }
  return Math.min(1, share);
}
