import { checkInteger, checkPrior, DesignInputError, type RatePrior } from '@/lib/design';

/**
 * Rate scenarios that stand for a prior in the maximin criterion: the median pair plus `count`
 * points on the ellipse at Mahalanobis radius `radius` of the bivariate normal on
 * (ln kSmall, ln kLarge), ln k = μ + L·(radius·cos θ, radius·sin θ) with L the Cholesky factor,
 * θ = 2πj/count.
 *
 * @param options.radius default 1 (one SD); options.count default 8 (1 to 360)
 * @throws DesignInputError for a bad prior, radius (finite, ≥ 0) or count
 * @example priorScenarios({ medianSmall: 0.02, medianLarge: 0.01, sdLogSmall: 1, sdLogLarge: 1, correlation: 0 }, { count: 4 }).length // 5
 */
export function priorScenarios(prior: RatePrior, options: { radius?: number; count?: number } = {}): { kSmall: number; kLarge: number }[] {
  checkPrior(prior);
  const radius = options.radius ?? 1;
  if (!(radius >= 0 && radius < Infinity)) throw new DesignInputError('radius', 'a finite number, 0 or more', radius);
  const count = options.count ?? 8;
  checkInteger('count', count, 1, 360);
  const m1 = Math.log(prior.medianSmall);
  const m2 = Math.log(prior.medianLarge);
  const { sdLogSmall: s1, sdLogLarge: s2, correlation: r } = prior;
  const c = s2 * Math.sqrt(Math.max(0, 1 - r * r));
  const out = [{ kSmall: prior.medianSmall, kLarge: prior.medianLarge }];
  for (let j = 0; j < count; j++) {
    const theta = (2 * Math.PI * j) / count;
    const z1 = radius * Math.cos(theta);
    const z2 = radius * Math.sin(theta);
    out.push({ kSmall: Math.exp(m1 + s1 * z1), kLarge: Math.exp(m2 + s2 * r * z1 + c * z2) });
  }
  return out;
}
