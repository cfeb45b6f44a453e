import { DesignInputError } from './DesignInputError';

export type RootOptions = {
  lower: number;
  upper: number;
  /** absolute tolerance on the root; default 1e-12 */
  tolerance?: number;
  /** default 200 */
  maxIterations?: number;
};

export type RootResult = { root: number; iterations: number; converged: boolean };

/**
 * A root of f inside a sign-changing bracket by the Brent–Dekker method (bisection,
 * secant and inverse quadratic interpolation; Brent 1973, "Algorithms for Minimization
 * without Derivatives", ch. 4). The bracket is kept at every step, so the method cannot
 * leave [lower, upper]; `converged` is false when maxIterations ran out.
 *
 * @throws DesignInputError when lower/upper are not finite, not ordered, or f has the same
 *   sign at both ends (no guaranteed bracket)
 * @example findRoot((x) => x * x - 2, { lower: 0, upper: 2 }).root // Math.SQRT2
 */
export function findRoot(f: (x: number) => number, options: RootOptions): RootResult {
  const { lower, upper } = options;
  const tolerance = options.tolerance ?? 1e-12;
  const maxIterations = options.maxIterations ?? 200;
  if (!Number.isFinite(lower)) throw new DesignInputError('lower', 'a finite number', lower);
  if (!(Number.isFinite(upper) && upper > lower)) throw new DesignInputError('upper', `a finite number above lower (${lower})`, upper);
  if (!(tolerance > 0)) throw new DesignInputError('tolerance', 'a number greater than 0', tolerance);
  const fl = f(lower);
  const fu = f(upper);
  if (!(fl <= 0 && fu >= 0) && !(fl >= 0 && fu <= 0)) {
    throw new DesignInputError('upper', 'the end of a bracket where f changes sign', upper);
  }
  const counter = { iterations: 0 };
  const root = zeroin(f, lower, upper, fl, fu, tolerance, maxIterations, counter);
  return { root: Number.isNaN(root) ? lastPoint : root, iterations: counter.iterations, converged: !Number.isNaN(root) };
}

let lastPoint = NaN;

/** The last iterate of the latest zeroin call that ran out of iterations. */
export function lastIterate(): number {
  return lastPoint;
}

/**
 * Unchecked Brent–Dekker iteration on a bracket [a, b] with f(a)·f(b) ≤ 0.
 * Returns NaN when maxIterations runs out (the last iterate is kept in `lastPoint`).
 */
export function zeroin(
  f: (x: number) => number,
  a: number,
  b: number,
  fa: number,
  fb: number,
  tolerance: number,
  maxIterations: number,
  counter?: { iterations: number },
): number {
  if (fa === 0) return a;
  if (fb === 0) return b;
  let c = b;
  let fc = fb;
  let d = b - a;
  let e = d;
  for (let iter = 1; iter <= maxIterations; iter++) {
    if (counter) counter.iterations = iter;
    if ((fb > 0 && fc > 0) || (fb < 0 && fc < 0)) {
      c = a;
      fc = fa;
      d = b - a;
      e = d;
    }
    if (Math.abs(fc) < Math.abs(fb)) {
      a = b;
      b = c;
      c = a;
      fa = fb;
      fb = fc;
      fc = fa;
    }
    const tol1 = 2 * Number.EPSILON * Math.abs(b) + 0.5 * tolerance;
    const xm = 0.5 * (c - b);
    if (Math.abs(xm) <= tol1 || fb === 0) return b;
    if (Math.abs(e) >= tol1 && Math.abs(fa) > Math.abs(fb)) {
      const s = fb / fa;
      let p: number;
      let q: number;
      if (a === c) {
        p = 2 * xm * s;
        q = 1 - s;
      } else {
        const qq = fa / fc;
        const r = fb / fc;
        p = s * (2 * xm * qq * (qq - r) - (b - a) * (r - 1));
        q = (qq - 1) * (r - 1) * (s - 1);
      }
      if (p > 0) q = -q;
      p = Math.abs(p);
      if (2 * p < Math.min(3 * xm * q - Math.abs(tol1 * q), Math.abs(e * q))) {
        e = d;
        d = p / q;
      } else {
        d = xm;
        e = d;
      }
    } else {
      d = xm;
      e = d;
    }
    a = b;
    fa = fb;
    b += Math.abs(d) > tol1 ? d : xm > 0 ? tol1 : -tol1;
    fb = f(b);
  }
  lastPoint = b;
  return NaN;
}
