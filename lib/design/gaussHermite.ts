import { checkInteger } from './validate';

export type QuadratureRule = { nodes: Float64Array; weights: Float64Array };

const PI_M4 = 0.7511255444649425; // π^(−1/4)
const cache = new Map<number, QuadratureRule>();

/**
 * Gauss–Hermite nodes and weights for ∫ e^(−x²) g(x) dx ≈ Σ w_i g(x_i), exact for polynomials
 * of degree up to 2n − 1. Nodes by Newton iteration on orthonormal Hermite polynomials with the
 * starting guesses of Press, Teukolsky, Vetterling & Flannery (2007), Numerical Recipes 3rd ed.,
 * §4.6.1 (routine gauher). For a standard normal Z: E g(Z) ≈ Σ (w_i/√π) g(√2·x_i).
 * Rules are cached per n.
 *
 * @param options.count number of nodes n, 1 to 200
 * @throws DesignInputError when count is not a whole number from 1 to 200
 * @example gaussHermite({ count: 1 }).weights[0] // √π
 */
export function gaussHermite(options: { count: number }): QuadratureRule {
  const n = options.count;
  checkInteger('count', n, 1, 200);
  const hit = cache.get(n);
  if (hit) return hit;
  const x = new Float64Array(n);
  const w = new Float64Array(n);
  const m = (n + 1) >> 1;
  let z = 0;
  for (let i = 0; i < m; i++) {
    if (i === 0) z = Math.sqrt(2 * n + 1) - 1.85575 * Math.pow(2 * n + 1, -0.16667);
    else if (i === 1) z -= (1.14 * Math.pow(n, 0.426)) / z;
    else if (i === 2) z = 1.86 * z - 0.86 * x[0];
    else if (i === 3) z = 1.91 * z - 0.91 * x[1];
    else z = 2 * z - x[i - 2];
    let pp = 0;
    for (let its = 0; its < 100; its++) {
      let p1 = PI_M4;
      let p2 = 0;
      for (let j = 0; j < n; j++) {
        const p3 = p2;
        p2 = p1;
        p1 = z * Math.sqrt(2 / (j + 1)) * p2 - Math.sqrt(j / (j + 1)) * p3;
      }
      pp = Math.sqrt(2 * n) * p2;
      const z1 = z;
      z = z1 - p1 / pp;
      if (Math.abs(z - z1) <= 1e-15 * Math.max(1, Math.abs(z))) break;
    }
    x[i] = z;
    x[n - 1 - i] = -z;
    w[i] = 2 / (pp * pp);
    w[n - 1 - i] = w[i];
  }
  if (n % 2 === 1) x[m - 1] = 0; // the middle node is exactly 0
  const rule = { nodes: x, weights: w };
  cache.set(n, rule);
  return rule;
}
