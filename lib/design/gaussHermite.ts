import { checkInteger } from './validate';

export type QuadratureRule = { nodes: Float64Array; weights: Float64Array };

const PI_M4 = 0.7511255444649425; // π^(−1/4)
const cache = new Map<number, QuadratureRule>();

/**
 * Gauss–Hermite nodes and weights for ∫ e^(−x²) g(x) dx ≈ Σ w_i g(x_i), exact for polynomials
 * of degree up to 2n − 1. For a standard normal Z: E g(Z) ≈ Σ (w_i/√π) g(√2·x_i). Rules are
 * cached per n; nodes are returned in descending order, symmetric about 0.
 *
 * Method: the nodes are the eigenvalues of the symmetric tridiagonal Jacobi matrix of the
 * Hermite recurrence (zero diagonal, off-diagonal √(j/2); Golub & Welsch 1969, Math Comp
 * 23:221–230), found by the implicit QL iteration with Wilkinson shifts (Press et al. 2007,
 * Numerical Recipes 3rd ed., §11.4, routine tqli, eigenvalues only). Each node is then polished
 * by Newton steps on the orthonormal Hermite recurrence, and its weight is 2/(√(2n)·p̃_(n−1))²
 * from the same recurrence (Numerical Recipes §4.6.1), which keeps every weight to a relative
 * accuracy of a few hundred ulps even where it is as small as 1e−170 (n = 200). Eigenvalues
 * start every Newton iteration within a few ulps of its own root, so no two nodes can share a
 * root (the failure of the classic start-value recipe beyond about n = 100).
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
  const start = jacobiEigenvalues(n);
  const x = new Float64Array(n);
  const w = new Float64Array(n);
  const m = (n + 1) >> 1;
  for (let i = 0; i < m; i++) {
    let z = start[i];
    let pp = 0;
    for (let its = 0; its < 8; its++) {
      const [p1, derivative] = hermiteAt(z, n);
      pp = derivative;
      const z1 = z;
      z = z1 - p1 / pp;
      if (Math.abs(z - z1) <= 2 * Number.EPSILON * Math.max(1, Math.abs(z))) break;
    }
    pp = hermiteAt(z, n)[1];
    x[i] = z;
    x[n - 1 - i] = -z;
    w[i] = 2 / (pp * pp);
    w[n - 1 - i] = w[i];
  }
  if (n % 2 === 1) {
    x[m - 1] = 0; // the middle node is exactly 0
    const pp = hermiteAt(0, n)[1];
    w[m - 1] = 2 / (pp * pp);
  }
  const rule = { nodes: x, weights: w };
  cache.set(n, rule);
  return rule;
}

/** The orthonormal Hermite polynomial p̃_n(z) (weight e^(−z²)) and its derivative √(2n)·p̃_(n−1)(z). */
function hermiteAt(z: number, n: number): [number, number] {
  let p1 = PI_M4;
  let p2 = 0;
  for (let j = 0; j < n; j++) {
    const p3 = p2;
    p2 = p1;
    p1 = z * Math.sqrt(2 / (j + 1)) * p2 - Math.sqrt(j / (j + 1)) * p3;
  }
  return [p1, Math.sqrt(2 * n) * p2];
}

/**
 * Eigenvalues, in descending order, of the n × n Jacobi matrix with zero diagonal and
 * off-diagonal √(j/2), j = 1…n − 1: the zeros of H_n. Implicit QL with Wilkinson shifts (tqli).
 */
function jacobiEigenvalues(n: number): Float64Array {
  const dg = new Float64Array(n);
  const e = new Float64Array(n);
  for (let j = 1; j < n; j++) e[j - 1] = Math.sqrt(j / 2);
  for (let l = 0; l < n; l++) {
    let iter = 0;
    let m: number;
    do {
      for (m = l; m < n - 1; m++) {
        const dd = Math.abs(dg[m]) + Math.abs(dg[m + 1]);
        if (Math.abs(e[m]) <= Number.EPSILON * dd) break;
      }
      if (m !== l) {
        if (iter++ === 60) throw new Error('gaussHermite: the eigenvalue iteration did not converge');
        let g = (dg[l + 1] - dg[l]) / (2 * e[l]);
        let r = Math.hypot(g, 1);
        g = dg[m] - dg[l] + e[l] / (g + (g >= 0 ? Math.abs(r) : -Math.abs(r)));
        let s = 1;
        let c = 1;
        let p = 0;
        let i: number;
        for (i = m - 1; i >= l; i--) {
          const f = s * e[i];
          const b = c * e[i];
          r = Math.hypot(f, g);
          e[i + 1] = r;
          if (r === 0) {
            dg[i + 1] -= p;
            e[m] = 0;
            break;
          }
          s = f / r;
          c = g / r;
          g = dg[i + 1] - p;
          r = (dg[i] - g) * s + 2 * c * b;
          p = s * r;
          dg[i + 1] = g + p;
          g = c * r - b;
        }
        if (r === 0 && i >= l) continue;
        dg[l] -= p;
        e[l] = g;
        e[m] = 0;
      }
    } while (m !== l);
  }
  return dg.sort().reverse();
}
