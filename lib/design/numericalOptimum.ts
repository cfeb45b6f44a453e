import { discountAt } from './discountFactor';
import { exponentialPowerDerivatives, hyperboloidDerivatives, powerDelayDerivatives, storeDerivatives } from './discountDerivatives';
import type { LateDelayOptimum } from './types';

/** The models whose optimal late delay has no closed form. */
export type NumericalModelId = 'hyperboloid' | 'power-delay' | 'exponential-power';

const LOG_MAX = Math.log(Number.MAX_VALUE);

/**
 * Zone and optimal late delay for the hyperboloid, power-delay and exponential-power models
 * (inputs already validated, d > 0): written into `out`, returning true, or false when the zone is empty.
 *
 * The bounds are the closed forms of zoneBounds.ts, written out here so that d^s and ln x serve
 * twice; they are reversalZone's expressions, except that the power models' lower bound is
 * d + exp(p·ln(a/K)) (its logarithm is needed anyway), which may differ from reversalZone's
 * d + (a/K)^p in the last bits. The optimum is the root of ψ(t) = d ln C/dt in t = ln(D − d):
 * see slopeRoot.
 */
export function numericalOptimum(id: NumericalModelId, s: number, x: number, d: number, k: number, K: number, out: LateDelayOptimum): boolean {
  let lower: number;
  let upper: number;
  let lowGap: number; // D_lower − d
  let tLow: number; // ln(D_lower − d)
  let farSoon: number; // x·f_k(d)
  let startDelay: number;
  if (id === 'hyperboloid') {
    // a = r^(1/s) − 1 (expm1 keeps it accurate for x near 1), b = a + (a + 1)·k·d, p = 1
    const a = Math.expm1(-Math.log(x) / s);
    const span = (a + 1) * k * d;
    if (!(span > K * d)) return false;
    lowGap = a / K;
    lower = d + lowGap;
    upper = (a + span) / K;
    if (!(upper > lower)) return false;
    tLow = Math.log(lowGap);
    // x·f_k(d) enters the hyperboloid gaps only as a factor (see evaluate), so ln and exp do
    farSoon = x * Math.exp(-s * Math.log1p(k * d));
    // f_K(delay) = m where q = 1 + K·delay = m^(−1/s); f′ = −s·r·m, f″ = −(s + 1)r·f′, f‴ = −(s + 2)r·f″ with r = K/q
    const m = 0.5 * (x + farSoon);
    const qm1 = Math.expm1(-Math.log(m) / s);
    const r = K / (1 + qm1);
    const f1 = -s * r * m;
    const f2 = -(s + 1) * r * f1;
    startDelay = startingDelay(qm1 / K, d, x - m, f1, f2, -(s + 2) * r * f2);
  } else {
    // a = (1 − x)/x or ln r, b = a + k·d^s (as zoneConstants writes them), p = 1/s; d^s also gives f_k(d)
    const ds = Math.pow(d, s);
    const power = id === 'power-delay';
    const a = power ? (1 - x) / x : -Math.log(x);
    const b = power ? (1 - x + k * ds) / x : k * ds + a;
    if (s === 1 && !(b - a > K * d)) return false;
    const p = 1 / s;
    tLow = p * Math.log(a / K);
    lowGap = Math.exp(tLow);
    lower = d + lowGap;
    upper = Math.pow(b / K, p);
    if (!(upper > lower)) return false;
    farSoon = x * (power ? 1 / (1 + k * ds) : Math.exp(-k * ds));
    // f_K(delay) = m where u = K·delay^s is (1 − m)/m (power-delay) or −ln m; the derivatives of f
    // there follow from u′ = s·u/delay, u″ = (s − 1)u′/delay, u‴ = (s − 2)u″/delay as in evaluate
    const m = 0.5 * (x + farSoon);
    const u = power ? (1 - m) / m : -Math.log(m);
    const mid = Math.exp(p * Math.log(u / K));
    const u1 = (s * u) / mid;
    const u2 = ((s - 1) * u1) / mid;
    const u3 = ((s - 2) * u2) / mid;
    const u11 = u1 * u1;
    const mm = power ? m * m : m;
    const f1 = -u1 * mm;
    const f2 = power ? (2 * u11 * m - u2) * mm : (u11 - u2) * m;
    const f3 = power ? (6 * u1 * u2 * m - 6 * u11 * u1 * mm - u3) * mm : (3 * u1 * u2 - u3 - u11 * u1) * m;
    startDelay = startingDelay(mid, d, x - m, f1, f2, f3);
  }
  // upper is Infinity when the bound overflows a double (tiny s); the search then stops at the largest double
  const tHigh = upper < Infinity ? Math.log(upper - d) : LOG_MAX;
  zone.id = id;
  zone.s = s;
  zone.x = x;
  zone.d = d;
  zone.K = K;
  zone.farSoon = farSoon;
  zone.lowGap = lowGap;
  zone.lower = lower;
  zone.upper = upper;
  zone.tLow = tLow;
  zone.tHigh = tHigh;
  zone.nearLow = 1 / (1 + K * lowGap);
  const start = Math.log(startDelay);
  if (!(start > tLow && start < tHigh)) {
    const middle = 0.5 * (tLow + tHigh);
    slopeRoot(middle, Math.exp(middle));
  } else {
    // the hyperboloid's gaps use D − d alone, so the series value serves as it is; the power models
    // take K·(D − d)^s as K·e^(st), which must belong to the same e = e^t
    slopeRoot(start, id === 'hyperboloid' ? startDelay : Math.exp(start));
  }
  out.lower = lower;
  out.upper = upper;
  out.lateDelay = state.lateDelay;
  out.gapProduct = state.far * state.near;
  return true;
}

/**
 * D₀ − d for a first point D₀ close to the optimum, from a series in the soon delay d.
 *
 * With e = D − d, C′ = 0 reads G = f′(e + d)·(x − f(e)) − f′(e)·(f(e + d) − x·f_k(d)) = 0. As
 * d → 0, C → (f − x·f_k(d))(x − f), largest where f = m = (x + x·f_k(d))/2, at e = e_m. Expanding
 * f(e + d) and f′(e + d) in d gives G = P + d·Q + (d²/2)·R + O(d³) with P = f′·(x + x·f_k(d) − 2f),
 * Q = f″(x − f) − f′², R = f‴(x − f) − f′f″. At e_m, P = 0, P′ = −2f′², P″ = −6f′f″ and
 * Q′ = f‴(x − f) − 3f′f″, so e = e_m + Δ1 + Δ2 with Δ1 = −d·Q/P′ and
 * Δ2 = −(P″Δ1²/2 + d·Q′Δ1 + d²R/2)/P′, all at e_m. `xm` is x − m, f1…f3 are f′, f″, f‴ at e_m.
 * When the series lands outside the zone the caller starts from the middle instead.
 */
function startingDelay(midDelay: number, d: number, xm: number, f1: number, f2: number, f3: number): number {
  const slope2 = 2 * f1 * f1; // −P′
  const first = (d * (f2 * xm - f1 * f1)) / slope2;
  const second = (-3 * f1 * f2 * first * first + d * (f3 * xm - 3 * f1 * f2) * first + 0.5 * d * d * (f3 * xm - f1 * f2)) / slope2;
  return midDelay + first + second;
}

/** The solve in hand: model, inputs, x·f_k(d), the zone and the bracket ends in t. */
const zone = { id: 'hyperboloid' as NumericalModelId, s: 1, x: 0.5, d: 1, K: 1, farSoon: 0, lowGap: 0, nearLow: 0, lower: 0, upper: 0, tLow: 0, tHigh: 0 };
/** Gaps at the returned point (module scratch keeps the solver allocation-free). */
const state = { lateDelay: 0, far: 0, near: 0 };
/** f and f⁽ⁿ⁾/f for n = 1…4, derivatives in t, of f_K at D (far) and at D − d (near). */
const far = new Float64Array(5);
const near = new Float64Array(5);
/** ψ and its first three derivatives in t at the last evaluated point. */
const psi = new Float64Array(4);

/**
 * Root of ψ(t) = d ln C/dt, t = ln(D − d), between t_L = ln(D_lower − d) and t_U = ln(D_upper − d).
 *
 * ψ = (ln A)′ + (ln B)′ has a simple pole of residue +1 at t_L, where B vanishes, and of residue −1
 * at t_U, where A vanishes, so it falls from +∞ to −∞ across the zone: a guaranteed bracket. The
 * steps are taken on Ψ = ψ·(t − t_L)(t_U − t), which has the same roots inside the zone but no
 * poles, and is close to linear (exactly t_L + t_U − 2t when both gaps are linear in t). Each step
 * is Householder's third-order step on Ψ (quartic convergence; analytic ψ′, ψ″ and ψ‴), taken
 * inside the bracket [lo, hi] that shrinks to the evaluated point on the side given by the sign
 * of ψ; a step leaving the bracket, or not halving the step before last, is replaced by bisection
 * (the safeguard of Press et al. 2007, Numerical Recipes 3rd ed., §9.4, "rtsafe").
 *
 * Stops once a step is at most 1e-5·min(1, distance to the nearer pole), or a few units in the
 * last place of t if that is larger: a fourth-order step that small leaves an error of order
 * 1e-20, as a Newton step of 1e-10 does. The returned point is that last step taken; D − d and
 * both gaps are carried to it by Taylor series to third order (the derivatives are at hand), so
 * no evaluation is spent on it. Leaves D and the gaps in `state`.
 */
function slopeRoot(start: number, startDelay: number): void {
  const tLow = zone.tLow;
  const tHigh = zone.tHigh;
  let lo = tLow;
  let hi = tHigh;
  let t = start;
  let step = hi - lo;
  let stepBefore = step;
  for (let iter = 0; iter < 200; iter++) {
    const e = evaluate(t, iter === 0 ? startDelay : Math.exp(t));
    const g = psi[0];
    if (g === 0) return; // on the root itself
    if (!Number.isFinite(g)) {
      // ψ is not finite only when the far gap is lost to underflow (f_K(D) below the smallest
      // double, as for exponential-power with K·D^s > 745), which happens from some D upwards:
      // the optimum lies below t. If f_K is lost at the zone's lower end already, the criterion
      // is zero everywhere and any point of the zone is as good.
      if (!(discountAt(zone.id, zone.K, zone.s, 1, zone.lower) > zone.farSoon)) return;
      hi = t;
      if (hi - lo <= 1e-10) return;
      stepBefore = step;
      step = hi - 0.5 * (lo + hi);
      t = 0.5 * (lo + hi);
      continue;
    }
    if (g > 0) lo = t;
    else hi = t;
    // Ψ = ψ·w with w = (t − t_L)(t_U − t): w′ = t_L + t_U − 2t, w″ = −2, w‴ = 0
    const w = (t - tLow) * (tHigh - t);
    const w1 = tLow + tHigh - 2 * t;
    const G = g * w;
    const G1 = psi[1] * w + g * w1;
    const G2 = psi[2] * w + 2 * psi[1] * w1 - 2 * g;
    const G3 = psi[3] * w + 3 * psi[2] * w1 - 6 * psi[1];
    const delta = (3 * G * (2 * G1 * G1 - G * G2)) / (6 * G1 * G1 * G1 - G * (6 * G1 * G2 - G * G3));
    // (in zones narrower than about 1e-10 in t the pole distance falls below the spacing of
    // doubles near t, and a step below a few units in the last place of t counts as converged)
    if (Math.abs(delta) <= Math.max(1e-5 * Math.min(1, t - tLow, tHigh - t), 8 * Number.EPSILON * Math.abs(t))) {
      // converged: move to t − δ (kept inside the bracket, which rounding could otherwise leave)
      const h = t - Math.min(hi, Math.max(lo, t - delta));
      const D = state.lateDelay;
      const lateDelay = zone.d + e * (1 - h + 0.5 * h * h - (h * h * h) / 6);
      // Each gap is moved by its own small Taylor increment, to the late delay as rounded for the
      // caller (D and D − d of that double), so that the gap product belongs to the returned delay.
      state.lateDelay = lateDelay;
      state.far += far[0] * taylorStep(far, shift((lateDelay - D) / e, h));
      state.near -= near[0] * taylorStep(near, shift((lateDelay - zone.d - e) / e, h));
      return;
    }
    let next = t - delta;
    if (!(next > lo && next < hi) || 2 * Math.abs(delta) > stepBefore) next = 0.5 * (lo + hi);
    if (hi - lo <= 1e-10) {
      // the bracket is down to 1e-10 in t (zones narrower than that, or steps lost in rounding):
      // the search ends with one evaluation at the step taken
      evaluate(next, Math.exp(next));
      return;
    }
    stepBefore = step;
    step = Math.abs(next - t);
    t = next;
  }
  throw new Error('optimiseLateDelay: the slope root did not converge in 200 steps');
}

/**
 * The shift η in t that multiplies e = e^t by 1 + y, i.e. e^(−η) = 1 + y: η = −ln(1 + y) by its series
 * (for |y| ≤ 1e-4 the error, about y⁴/4, is below 3e-17). A larger y arises only when e is within a
 * few units in the last place of D; the step h itself is used then.
 */
function shift(y: number, h: number): number {
  return Math.abs(y) <= 1e-4 ? -y * (1 - y * (0.5 - y / 3)) : h;
}

/** (f(t − η) − f(t))/f from v = [f, f′/f, f″/f, f‴/f]: −η·v1 + η²/2·v2 − η³/6·v3 (the next term is below 1e-20). */
function taylorStep(v: Float64Array, eta: number): number {
  return eta * (-v[1] + eta * (0.5 * v[2] - (eta * v[3]) / 6));
}

/**
 * Fills `far`, `near` and `psi` at t, with e = e^t = D − d, and D and the gaps at t in `state`; returns e.
 *
 * With α_n = A⁽ⁿ⁾/A and β_n = B⁽ⁿ⁾/B (derivatives in t), the log-derivatives of each gap are
 * (ln A)′ = α1, (ln A)″ = α2 − α1², (ln A)‴ = α3 − 3α1α2 + 2α1³ and
 * (ln A)⁗ = α4 − 4α1α3 − 3α2² + 12α1²α2 − 6α1⁴; ψ⁽ⁿ⁾ = (ln A)⁽ⁿ⁺¹⁾ + (ln B)⁽ⁿ⁺¹⁾.
 */
function evaluate(t: number, e: number): number {
  const { id, s, x, d, K, farSoon } = zone;
  const D = d + e;
  let A: number;
  let B: number;
  if (id === 'hyperboloid') {
    // ln f = −s·ln q with q = 1 + K·delay; dq/dt = K·e. Both gaps are differences of two values of
    // f, so each is taken as one ratio of q's instead of a difference of powers:
    // A = f(D) − f(D_upper) = x·f_k(d)·((q_upper/q)^s − 1), B = f(D_lower − d) − f(D − d) = x·(1 − (q_lower/q_near)^s),
    // where q_upper/q = 1 + K(D_upper − D)/q and q_near/q_lower = 1 + K(e − (D_lower − d))/q_lower
    const q = 1 + K * D;
    const qNear = 1 + K * e;
    const upper = zone.upper;
    // (an upper bound beyond the largest double, or x·f_k(d) lost to underflow, leaves only the difference of powers)
    A = upper < Infinity && farSoon > 0 ? farSoon * Math.expm1(s * Math.log1p((K * (upper - D)) / q)) : Math.pow(q, -s) - farSoon;
    const lowGap = zone.lowGap; // q_lower = 1 + K·lowGap, and zone.nearLow = 1/q_lower
    const nearRatio = -s * Math.log1p(K * (e - lowGap) * zone.nearLow);
    B = -x * Math.expm1(nearRatio);
    // f(D − d) = x − B loses digits only when B is most of x
    hyperboloidDerivatives(far, s, farSoon + A, (K * e) / q, (1 + K * d) / q);
    hyperboloidDerivatives(near, s, B < 0.5 * x ? x - B : x * Math.exp(nearRatio), (K * e) / qNear, 1 / qNear);
  } else {
    // u = K·delay^s, so ln u has derivatives s·ρ, s·ρ(1 − ρ), … with ρ = e/D at the far point
    // and simply s, 0, 0, 0 at the near point (delay = e^t)
    const uFar = K * Math.pow(D, s);
    const uNear = K * Math.exp(s * t);
    const rho = e / D;
    const s2 = s * s;
    if (id === 'power-delay') {
      powerDelayDerivatives(far, s, uFar, rho, d / D);
      const f = 1 / (1 + uNear);
      const s1 = uNear * f;
      const sf = s1 * f;
      storeDerivatives(near, f, -s1 * s, -sf * s2, -sf * (1 - 2 * s1) * s2 * s, -sf * (1 - 6 * sf) * s2 * s2);
    } else {
      exponentialPowerDerivatives(far, s, uFar, rho, d / D);
      const u = -uNear;
      storeDerivatives(near, Math.exp(u), u * s, u * s2, u * s2 * s, u * s2 * s2);
    }
    A = far[0] - farSoon;
    B = x - near[0];
  }
  state.lateDelay = D;
  state.far = A;
  state.near = B;
  const c = far[0] / A;
  const a1 = c * far[1];
  const a2 = c * far[2];
  const a3 = c * far[3];
  const a4 = c * far[4];
  const cNear = -near[0] / B;
  const b1 = cNear * near[1];
  const b2 = cNear * near[2];
  const b3 = cNear * near[3];
  const b4 = cNear * near[4];
  const a11 = a1 * a1;
  const b11 = b1 * b1;
  psi[0] = a1 + b1;
  psi[1] = a2 - a11 + b2 - b11;
  psi[2] = a3 - 3 * a1 * a2 + 2 * a11 * a1 + b3 - 3 * b1 * b2 + 2 * b11 * b1;
  psi[3] = a4 - 4 * a1 * a3 - 3 * a2 * a2 + 12 * a11 * a2 - 6 * a11 * a11 + b4 - 4 * b1 * b3 - 3 * b2 * b2 + 12 * b11 * b2 - 6 * b11 * b11;
  return e;
}
