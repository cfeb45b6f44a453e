// Derivatives in t of the hyperboloid, power-delay and exponential-power discount factors along
// a delay c + e^t (c = d at the far view's D, c = 0 at the near view's D − d), as f and the ratios
// f⁽ⁿ⁾/f for n = 1…4 written into out[0…4]. They feed the slope root of numericalOptimum.ts.

/**
 * Stores f and f⁽ⁿ⁾/f = Y_n(l1, …, l4), the complete Bell polynomials of the derivatives l_n of ln f
 * (Faà di Bruno's formula for f = exp(ln f)).
 */
export function storeDerivatives(out: Float64Array, f: number, l1: number, l2: number, l3: number, l4: number): void {
  const l11 = l1 * l1;
  out[0] = f;
  out[1] = l1;
  out[2] = l2 + l11;
  out[3] = l3 + 3 * l1 * l2 + l11 * l1;
  out[4] = l4 + 4 * l1 * l3 + 3 * l2 * l2 + 6 * l11 * l2 + l11 * l11;
}

// A logarithm m = ln(b + a·e^t) (constants a, b > 0) has m′ = ρ = a·e^t/(b + a·e^t) and ρ′ = ρ(1 − ρ),
// so m″ = ρ(1 − ρ), m‴ = m″(1 − 2ρ), m⁗ = m″(1 − 6ρ(1 − ρ)); `rest` is 1 − ρ, passed in without cancellation.

/** Hyperboloid: ln f = −s·m with m = ln q, q = 1 + K(c + e^t), so ρ = K·e^t/q. */
export function hyperboloidDerivatives(out: Float64Array, s: number, f: number, rho: number, rest: number): void {
  const m2 = rho * rest;
  storeDerivatives(out, f, -s * rho, -s * m2, -s * m2 * (1 - 2 * rho), -s * m2 * (1 - 6 * m2));
}

/**
 * Power-delay: f = 1/(1 + u), ln f = −softplus(m) with m = ln u = ln K + s·ln(c + e^t), so m′ = s·ρ
 * with ρ = e^t/(c + e^t). The derivatives of
 * softplus are σ = u/(1 + u) = 1 − f, σ′ = σf, σ″ = σf(1 − 2σ), σ‴ = σf(1 − 6σf).
 */
export function powerDelayDerivatives(out: Float64Array, s: number, u: number, rho: number, rest: number): void {
  const f = 1 / (1 + u);
  const m1 = s * rho;
  const m2 = m1 * rest;
  const m3 = m2 * (1 - 2 * rho);
  const m4 = m2 * (1 - 6 * rho * rest);
  const s1 = u * f;
  const s2 = s1 * f;
  const s3 = s2 * (1 - 2 * s1);
  const s4 = s2 * (1 - 6 * s2);
  const m11 = m1 * m1;
  storeDerivatives(out, f, -s1 * m1, -(s1 * m2 + s2 * m11), -(s1 * m3 + 3 * s2 * m1 * m2 + s3 * m11 * m1), -(s1 * m4 + s2 * (4 * m1 * m3 + 3 * m2 * m2) + 6 * s3 * m11 * m2 + s4 * m11 * m11));
}

/** Exponential-power: ln f = −u with u = e^m, m = ln K + s·ln(c + e^t) as for power-delay, so u⁽ⁿ⁾/u = Y_n(m′, …, m⁗). */
export function exponentialPowerDerivatives(out: Float64Array, s: number, u: number, rho: number, rest: number): void {
  const m1 = s * rho;
  const m2 = m1 * rest;
  const m3 = m2 * (1 - 2 * rho);
  const m4 = m2 * (1 - 6 * rho * rest);
  const m11 = m1 * m1;
  storeDerivatives(out, Math.exp(-u), -u * m1, -u * (m2 + m11), -u * (m3 + 3 * m1 * m2 + m11 * m1), -u * (m4 + 4 * m1 * m3 + 3 * m2 * m2 + 6 * m11 * m2 + m11 * m11));
}
