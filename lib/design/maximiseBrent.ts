import { DesignInputError } from './DesignInputError';

export type MaximiseOptions = {
  lower: number;
  upper: number;
  /** relative tolerance on the argument; default 1e-10 (Brent's method cannot do better than ~sqrt(machine epsilon) on a smooth maximum's location, see below) */
  tolerance?: number;
  /** absolute tolerance added near 0; default 1e-14 */
  absoluteTolerance?: number;
  /** default 200 */
  maxIterations?: number;
};

export type MaximiseResult = { argmax: number; value: number; iterations: number; converged: boolean };

const GOLDEN = 0.3819660112501051; // (3 − √5)/2

/**
 * Maximum of f on [lower, upper] by Brent's method (golden-section search with parabolic
 * interpolation; Brent 1973, "Algorithms for Minimization without Derivatives", ch. 5).
 * Finds a local maximum; it is the global one when f is unimodal on the interval.
 *
 * Function values alone locate a smooth maximum only to about sqrt(machine epsilon) ≈ 1.5e-8
 * relative, because f changes by O(δ²) there; callers that need the argument to 1e-10 solve
 * f′ = 0 with a bracketed root finder instead (optimiseLateDelay does, with its own).
 *
 * @throws DesignInputError for non-finite or unordered bounds, or a non-positive tolerance
 * @example maximiseBrent((x) => -(x - 1) * (x - 1), { lower: 0, upper: 3 }).argmax // ≈ 1
 */
export function maximiseBrent(f: (x: number) => number, options: MaximiseOptions): MaximiseResult {
  const { lower, upper } = options;
  const tol = options.tolerance ?? 1e-10;
  const zeps = options.absoluteTolerance ?? 1e-14;
  const maxIterations = options.maxIterations ?? 200;
  if (!Number.isFinite(lower)) throw new DesignInputError('lower', 'a finite number', lower);
  if (!(Number.isFinite(upper) && upper > lower)) throw new DesignInputError('upper', `a finite number above lower (${lower})`, upper);
  if (!(tol > 0)) throw new DesignInputError('tolerance', 'a number greater than 0', tol);
  let a = lower;
  let b = upper;
  let x = a + GOLDEN * (b - a);
  let w = x;
  let v = x;
  let fx = -f(x);
  let fw = fx;
  let fv = fx;
  let d = 0;
  let e = 0;
  for (let iter = 1; iter <= maxIterations; iter++) {
    const xm = 0.5 * (a + b);
    const tol1 = tol * Math.abs(x) + zeps;
    const tol2 = 2 * tol1;
    if (Math.abs(x - xm) <= tol2 - 0.5 * (b - a)) return { argmax: x, value: -fx, iterations: iter, converged: true };
    let golden = true;
    if (Math.abs(e) > tol1) {
      const r = (x - w) * (fx - fv);
      let q = (x - v) * (fx - fw);
      let p = (x - v) * q - (x - w) * r;
      q = 2 * (q - r);
      if (q > 0) p = -p;
      q = Math.abs(q);
      const etemp = e;
      e = d;
      if (!(Math.abs(p) >= Math.abs(0.5 * q * etemp) || p <= q * (a - x) || p >= q * (b - x))) {
        d = p / q;
        const u = x + d;
        if (u - a < tol2 || b - u < tol2) d = xm - x >= 0 ? tol1 : -tol1;
        golden = false;
      }
    }
    if (golden) {
      e = x >= xm ? a - x : b - x;
      d = GOLDEN * e;
    }
    const u = Math.abs(d) >= tol1 ? x + d : x + (d >= 0 ? tol1 : -tol1);
    const fu = -f(u);
    if (fu <= fx) {
      if (u >= x) a = x;
      else b = x;
      v = w;
      w = x;
      x = u;
      fv = fw;
      fw = fx;
      fx = fu;
    } else {
      if (u < x) a = u;
      else b = u;
      if (fu <= fw || w === x) {
        v = w;
        w = u;
        fv = fw;
        fw = fu;
      } else if (fu <= fv || v === x || v === w) {
        v = u;
        fv = fu;
      }
    }
  }
  return { argmax: x, value: -fx, iterations: maxIterations, converged: false };
}
