import type { ModelId } from './types';

/**
 * Closed-form zone bounds shared by reversalZone and reversibleShare (numericalOptimum, behind
 * optimiseLateDelay, writes the same expressions out for its three models).
 *
 * Every model's bounds take the form
 *   D_lower = d + (a / K)^p   (near gap B = 0: f_K(D − d) = x)
 *   D_upper = (b / K)^p       (far gap A = 0:  f_K(D) = x·f_k(d))
 * obtained by inverting f_K. With r = 1/x:
 *   exponential        a = ln r,                b = k·d + ln r,            p = 1
 *   hyperbolic         a = (1 − x)/x,           b = (1 − x + k·d)/x,       p = 1
 *   hyperboloid        a = r^(1/s) − 1,         b = r^(1/s)·(1 + k·d) − 1, p = 1
 *   power-delay        a = (1 − x)/x,           b = (1 − x + k·d^s)/x,     p = 1/s
 *   exponential-power  a = ln r,                b = k·d^s + ln r,          p = 1/s
 *   quasi-hyperbolic   a = max(0, ln(β/x)),     b = k·d + ln r,            p = 1   (d > 0)
 * All six rows are written out in docs/mathematics.md, "Closed forms".
 * `span` is b − a computed without cancellation; for p = 1 the zone is non-empty iff
 * span > K·d (e.g. k > K for the exponential model, k > xK for the hyperbolic one).
 */
export type ZoneConstants = { a: number; b: number; p: number; span: number };

/** Fills `out` with a, b, p for the model (inputs already validated). Returns out. */
export function zoneConstants(
  id: ModelId,
  x: number,
  d: number,
  k: number,
  s: number,
  beta: number,
  out: ZoneConstants,
): ZoneConstants {
  const lnR = -Math.log(x);
  switch (id) {
    case 'exponential':
      out.a = lnR;
      out.b = k * d + lnR;
      out.p = 1;
      out.span = k * d;
      break;
    case 'hyperbolic':
      out.a = (1 - x) / x;
      out.b = (1 - x + k * d) / x;
      out.p = 1;
      out.span = (k * d) / x;
      break;
    case 'hyperboloid': {
      // expm1 keeps r^(1/s) − 1 accurate when x is close to 1
      out.a = Math.expm1(lnR / s);
      out.span = (out.a + 1) * k * d;
      out.b = out.a + out.span;
      out.p = 1;
      break;
    }
    case 'power-delay':
      out.a = (1 - x) / x;
      out.b = (1 - x + k * Math.pow(d, s)) / x;
      out.p = 1 / s;
      out.span = out.b - out.a;
      break;
    case 'exponential-power':
      out.a = lnR;
      out.b = k * Math.pow(d, s) + lnR;
      out.p = 1 / s;
      out.span = out.b - out.a;
      break;
    case 'quasi-hyperbolic':
      out.a = Math.max(0, Math.log(beta) + lnR);
      out.b = k * d + lnR;
      out.p = 1;
      out.span = out.a > 0 ? k * d - Math.log(beta) : out.b;
      break;
  }
  return out;
}
