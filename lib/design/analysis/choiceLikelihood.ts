import { DesignInputError } from '../DesignInputError';
import { discountAt } from '../discountFactor';
import type { ModelId } from '../types';

/**
 * One binary choice as the refit sees it: the sooner amount after soonerDelay days, valued with
 * the rate of `soonerMagnitude`, against the later amount after laterDelay days, valued with the
 * rate of `laterMagnitude`. Calibration items use one magnitude for both options; the pairs of
 * the probe block value the smaller reward with k and the larger with K (docs/mathematics.md).
 */
export type FitChoice = {
  soonerAmount: number;
  soonerDelay: number;
  soonerMagnitude: 'small' | 'large';
  laterAmount: number;
  laterDelay: number;
  laterMagnitude: 'small' | 'large';
  /** true when the later option was chosen */
  later: boolean;
};

/** Choices packed into typed arrays once, so the likelihood loops touch no objects. */
export type PackedChoices = {
  n: number;
  /** sooner amount / later amount */
  share: Float64Array;
  soonDelay: Float64Array;
  lateDelay: Float64Array;
  /** ln of the delays (−Infinity for 0), cached for the power models */
  lnSoon: Float64Array;
  lnLate: Float64Array;
  /** 0 = small (k), 1 = large (K) */
  soonMagnitude: Uint8Array;
  lateMagnitude: Uint8Array;
  later: Uint8Array;
};

/**
 * Packs choices for the likelihood, checking each field.
 *
 * @throws DesignInputError naming `choices[i].<field>` for a non-positive amount, a sooner
 *   amount not below the later one, a negative delay, a later delay not above the sooner one,
 *   or an unknown magnitude
 * @example packChoices([{ soonerAmount: 5, soonerDelay: 0, soonerMagnitude: 'small', laterAmount: 10, laterDelay: 7, laterMagnitude: 'small', later: true }]).n // 1
 */
export function packChoices(choices: readonly FitChoice[]): PackedChoices {
  if (!Array.isArray(choices)) throw new DesignInputError('choices', 'a list of choices', choices);
  const n = choices.length;
  const packed: PackedChoices = {
    n,
    share: new Float64Array(n),
    soonDelay: new Float64Array(n),
    lateDelay: new Float64Array(n),
    lnSoon: new Float64Array(n),
    lnLate: new Float64Array(n),
    soonMagnitude: new Uint8Array(n),
    lateMagnitude: new Uint8Array(n),
    later: new Uint8Array(n),
  };
  choices.forEach((c, i) => {
    const at = `choices[${i}]`;
    if (c === null || typeof c !== 'object') throw new DesignInputError(at, 'a choice object', c);
    if (!(c.laterAmount > 0 && c.laterAmount < Infinity)) throw new DesignInputError(`${at}.laterAmount`, 'a finite amount greater than 0', c.laterAmount);
    if (!(c.soonerAmount > 0 && c.soonerAmount < c.laterAmount)) throw new DesignInputError(`${at}.soonerAmount`, `an amount greater than 0 and below the later amount (${c.laterAmount})`, c.soonerAmount);
    if (!(c.soonerDelay >= 0 && c.soonerDelay < Infinity)) throw new DesignInputError(`${at}.soonerDelay`, 'a finite number of days, 0 or more', c.soonerDelay);
    if (!(c.laterDelay > c.soonerDelay && c.laterDelay < Infinity)) throw new DesignInputError(`${at}.laterDelay`, `a finite number of days above the sooner delay (${c.soonerDelay})`, c.laterDelay);
    packed.share[i] = c.soonerAmount / c.laterAmount;
    packed.soonDelay[i] = c.soonerDelay;
    packed.lateDelay[i] = c.laterDelay;
    packed.lnSoon[i] = Math.log(c.soonerDelay);
    packed.lnLate[i] = Math.log(c.laterDelay);
    packed.soonMagnitude[i] = magnitude(`${at}.soonerMagnitude`, c.soonerMagnitude);
    packed.lateMagnitude[i] = magnitude(`${at}.laterMagnitude`, c.laterMagnitude);
    if (typeof c.later !== 'boolean') throw new DesignInputError(`${at}.later`, 'true (later chosen) or false (sooner chosen)', c.later);
    packed.later[i] = c.later ? 1 : 0;
  });
  return packed;
}

function magnitude(field: string, value: unknown): 0 | 1 {
  if (value === 'small') return 0;
  if (value === 'large') return 1;
  throw new DesignInputError(field, "'small' or 'large'", value);
}

/** Parameters on the fitting scale: ln k, ln K and the shape parameter's log (ln s or ln β; 0 for none). */
export type Theta = [number, number, number];

/**
 * Discount factor and its first and second derivatives in u = ln k and v = ln(shape), written
 * into `out` at `at` as [f, f_u, f_v, f_uu, f_uv, f_vv], for rate k, shape s or β (v is ln s or
 * ln β; f_v = 0 for the one-parameter models), delay D with ln D given. f(0) = 1 for every model
 * (quasi-hyperbolic included). With w = k·D^s the power models are f = 1/(1 + w) and
 * f = e^(−w), and w_u = w, w_v = c·w, w_vv = c(c + 1)·w with c = s·ln D.
 */
export function discountWithSlopes(id: ModelId, k: number, shape: number, D: number, lnD: number, out: Float64Array, at: number): void {
  if (D === 0) {
    out.fill(0, at + 1, at + 6);
    out[at] = 1;
    return;
  }
  let f = 0;
  let fu = 0;
  let fv = 0;
  let fuu = 0;
  let fuv = 0;
  let fvv = 0;
  switch (id) {
    case 'exponential': {
      const kd = k * D;
      f = Math.exp(-kd);
      fu = -kd * f;
      fuu = (kd * kd - kd) * f;
      break;
    }
    case 'hyperbolic': {
      const kd = k * D;
      f = 1 / (1 + kd);
      fu = -kd * f * f;
      fuu = -kd * f * f + 2 * kd * kd * f * f * f;
      break;
    }
    case 'hyperboloid': {
      const kd = k * D;
      const a = kd / (1 + kd);
      const b = Math.log1p(kd);
      f = Math.exp(-shape * b);
      fu = -shape * a * f;
      fv = -shape * b * f;
      fuu = (-shape * a * (1 - a) + shape * shape * a * a) * f;
      fuv = (-shape * a + shape * shape * a * b) * f;
      fvv = (-shape * b + shape * shape * b * b) * f;
      break;
    }
    case 'power-delay': {
      const w = k * Math.exp(shape * lnD);
      const c = shape * lnD;
      f = 1 / (1 + w);
      const f2 = f * f;
      const f3 = f2 * f;
      fu = -w * f2;
      fv = -c * w * f2;
      fuu = -w * f2 + 2 * w * w * f3;
      fuv = -c * w * f2 + 2 * c * w * w * f3;
      fvv = -c * (c + 1) * w * f2 + 2 * c * c * w * w * f3;
      break;
    }
    case 'exponential-power': {
      const w = k * Math.exp(shape * lnD);
      const c = shape * lnD;
      f = Math.exp(-w);
      fu = -w * f;
      fv = -c * w * f;
      fuu = (w * w - w) * f;
      fuv = (c * w * w - c * w) * f;
      fvv = (c * c * w * w - c * (c + 1) * w) * f;
      break;
    }
    case 'quasi-hyperbolic': {
      const kd = k * D;
      f = shape * Math.exp(-kd);
      fu = -kd * f;
      fv = f;
      fuu = (kd * kd - kd) * f;
      fuv = -kd * f;
      fvv = f;
      break;
    }
  }
  out[at] = f;
  out[at + 1] = fu;
  out[at + 2] = fv;
  out[at + 3] = fuu;
  out[at + 4] = fuv;
  out[at + 5] = fvv;
}

/**
 * Work space for the likelihood: gradient (3), Fisher information and the observed information
 * −∂²ℓ/∂θ∂θᵀ (3 × 3 each, row-major).
 */
export type LikelihoodScratch = { gradient: Float64Array; information: Float64Array; observed: Float64Array };

/** A fresh scratch area. */
export function likelihoodScratch(): LikelihoodScratch {
  return { gradient: new Float64Array(3), information: new Float64Array(9), observed: new Float64Array(9) };
}

const slopes = new Float64Array(12);
const gradGap = new Float64Array(3);
const hessGap = new Float64Array(9);

/**
 * Log-likelihood of the choices at θ = (ln k, ln K, ln shape) under logistic choice with lapse:
 *   P(later) = ε/2 + (1 − ε)·σ(γ·Δ),  Δ = f_{r(later)}(D) − (S/L)·f_{r(sooner)}(d)
 * (Luce 1959; the value difference in units of the later amount, as estimateRates and the power
 * engine use it). With `scratch`, also fills the analytic gradient in θ, the Fisher (expected)
 * information Σ (∂p/∂θ)(∂p/∂θ)ᵀ / (p(1 − p)) and the observed information
 * −Σ [ℓ″(Δ)·∇Δ∇Δᵀ + ℓ′(Δ)·∇²Δ] (Cox & Hinkley 1974, Theoretical Statistics, §4.8 and §9.2).
 */
export function choiceLogLikelihood(
  id: ModelId,
  data: PackedChoices,
  theta: Theta,
  gamma: number,
  lapse: number,
  scratch?: LikelihoodScratch,
): number {
  if (!scratch) return logLikelihoodOnly(id, data, theta, gamma, lapse);
  const rates = [Math.exp(theta[0]), Math.exp(theta[1])];
  const shape = Math.exp(theta[2]);
  const v = slopes; // late [f, f_u, f_v, f_uu, f_uv, f_vv], then soon
  const g = scratch?.gradient;
  const info = scratch?.information;
  const obs = scratch?.observed;
  if (g) g.fill(0);
  if (info) info.fill(0);
  if (obs) obs.fill(0);
  let sum = 0;
  for (let i = 0; i < data.n; i++) {
    const lm = data.lateMagnitude[i];
    const sm = data.soonMagnitude[i];
    discountWithSlopes(id, rates[lm], shape, data.lateDelay[i], data.lnLate[i], v, 0);
    discountWithSlopes(id, rates[sm], shape, data.soonDelay[i], data.lnSoon[i], v, 6);
    const x = data.share[i];
    const gap = v[0] - x * v[6];
    const z = gamma * gap;
    // σ(z) and 1 − σ(z) each without cancellation
    const e = Math.exp(-Math.abs(z));
    const big = 1 / (1 + e);
    const small = e / (1 + e);
    const sigma = z >= 0 ? big : small;
    const rest = z >= 0 ? small : big;
    const p = 0.5 * lapse + (1 - lapse) * sigma;
    const q = 0.5 * lapse + (1 - lapse) * rest;
    const chose = data.later[i] === 1;
    // without a lapse, ln σ(±z) = −|z|·[wrong side] − ln(1 + e^(−|z|)) keeps the far tail
    if (lapse === 0) sum += (chose === z >= 0 ? 0 : -Math.abs(z)) - Math.log1p(e);
    else sum += Math.log(chose ? p : q);
    if (!g || !info || !obs) continue;
    const dp = (1 - lapse) * gamma * sigma * rest; // ∂p/∂Δ
    const d2p = dp * gamma * (rest - sigma); // ∂²p/∂Δ²
    // ℓ′(Δ) and ℓ″(Δ): γ·(1 − σ), −γ·σ and −γ²σ(1 − σ) without a lapse (no 0/0 in the tails)
    let score: number;
    let curvature: number;
    if (lapse === 0) {
      score = chose ? gamma * rest : -gamma * sigma;
      curvature = -gamma * gamma * sigma * rest;
    } else if (chose) {
      score = dp / p;
      curvature = (d2p * p - dp * dp) / (p * p);
    } else {
      score = -dp / q;
      curvature = (-d2p * q - dp * dp) / (q * q);
    }
    const w = lapse === 0 ? gamma * gamma * sigma * rest : (dp * dp) / (p * q);
    gradGap.fill(0);
    hessGap.fill(0);
    // later option: +f at rate index lm; sooner option: −x·f at rate index sm
    gradGap[lm] += v[1];
    gradGap[2] += v[2];
    hessGap[lm * 4] += v[3];
    hessGap[lm * 3 + 2] += v[4];
    hessGap[8] += v[5];
    gradGap[sm] -= x * v[7];
    gradGap[2] -= x * v[8];
    hessGap[sm * 4] -= x * v[9];
    hessGap[sm * 3 + 2] -= x * v[10];
    hessGap[8] -= x * v[11];
    for (let a = 0; a < 3; a++) {
      g[a] += score * gradGap[a];
      for (let b = a; b < 3; b++) {
        const gg = gradGap[a] * gradGap[b];
        info[a * 3 + b] += w * gg;
        obs[a * 3 + b] -= curvature * gg + score * hessGap[a * 3 + b];
      }
    }
  }
  if (info && obs) {
    for (let a = 0; a < 3; a++) {
      for (let b = 0; b < a; b++) {
        info[a * 3 + b] = info[b * 3 + a];
        obs[a * 3 + b] = obs[b * 3 + a];
      }
    }
  }
  return sum;
}

/** The log-likelihood alone (grid and line-search evaluations): discount factors without derivatives. */
function logLikelihoodOnly(id: ModelId, data: PackedChoices, theta: Theta, gamma: number, lapse: number): number {
  const k0 = Math.exp(theta[0]);
  const k1 = Math.exp(theta[1]);
  const shape = Math.exp(theta[2]);
  const s = id === 'quasi-hyperbolic' ? 1 : shape;
  const beta = id === 'quasi-hyperbolic' ? shape : 1;
  let sum = 0;
  for (let i = 0; i < data.n; i++) {
    const late = discountAt(id, data.lateMagnitude[i] === 0 ? k0 : k1, s, beta, data.lateDelay[i]);
    const d = data.soonDelay[i];
    const soon = d === 0 ? 1 : discountAt(id, data.soonMagnitude[i] === 0 ? k0 : k1, s, beta, d);
    const z = gamma * (late - data.share[i] * soon);
    const e = Math.exp(-Math.abs(z));
    const chose = data.later[i] === 1;
    if (lapse === 0) sum += (chose === z >= 0 ? 0 : -Math.abs(z)) - Math.log1p(e);
    else {
      const sigma = z >= 0 ? 1 / (1 + e) : e / (1 + e);
      const rest = z >= 0 ? e / (1 + e) : 1 / (1 + e);
      sum += Math.log(0.5 * lapse + (1 - lapse) * (chose ? sigma : rest));
    }
  }
  return sum;
}
