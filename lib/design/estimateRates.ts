import { logChoiceProbability } from './choiceProbability';
import { discountAt } from './discountFactor';
import { DesignInputError } from './DesignInputError';
import type { CalibrationItem, Magnitude } from './calibrationItems';
import { indifferenceRate } from './indifferenceRate';
import { maximiseBrent } from './maximiseBrent';
import { checkModel } from './validate';
import type { ModelId, ModelSpec } from './types';

export type Choice = 'SS' | 'LL';
export type EstimateFlag = 'all-sooner' | 'all-later' | 'boundary' | 'non-monotone';

export type RateEstimate = {
  /** ML estimate of k, per day (a bound when flagged all-sooner, all-later or boundary) */
  rate: number;
  logRate: number;
  /** standard error of ln k from the observed information; null when it is not defined */
  standardErrorLog: number | null;
  /** Wald 95 % interval for k, exp(ln k ± 1.959964·SE); null with the SE */
  interval: { lower: number; upper: number } | null;
  flags: EstimateFlag[];
  logLikelihood: number;
  itemCount: number;
};

export type RateEstimates = { small: RateEstimate; large: RateEstimate; sensitivity: number; sensitivityEstimated: boolean };

export type EstimateOptions = {
  /** logistic sensitivity γ (per unit of the later amount); fixed unless estimateSensitivity; default 10 */
  sensitivity?: number;
  /** lapse ε in [0, 1); default 0 */
  lapse?: number;
  /** profile γ over [0.5, 500] by maximum likelihood as well; default false */
  estimateSensitivity?: boolean;
  /** share of choices the best single switch point must explain before 'non-monotone' is raised; default 0.75 */
  consistencyThreshold?: number;
};

const LOG_K_MIN = Math.log(1e-6);
const LOG_K_MAX = Math.log(10);
const GRID = 24;
const Z975 = 1.959963984540054; // Φ⁻¹(0.975)

/**
 * Maximum-likelihood discount rate per magnitude from binary calibration choices.
 * Model: P(LL) = ε/2 + (1 − ε)·σ(γ·(L·f(D; k) − S·f(d; k))/L) (logistic on the value difference
 * in units of the later amount). For each magnitude, ln k is maximised on [ln 1e-6, ln 10] by a
 * 24-point grid followed by Brent's method in the best cell (so a second local maximum cannot
 * capture the answer); the SE is 1/√(observed information) from a central second difference
 * (h = 1e-3 in ln k; the truncation error O(h²) is far below sampling error). With
 * estimateSensitivity, γ is chosen by profile likelihood (Brent on ln γ) and SEs are conditional
 * on γ̂.
 *
 * Flags instead of silent bounds: 'all-sooner' (every choice SS: the likelihood rises towards
 * k = 10, which is returned), 'all-later' (every choice LL: k = 1e-6 returned), 'boundary'
 * (interior data but the maximum is at a bound), 'non-monotone' (no single switch point in
 * item tie rate explains at least consistencyThreshold of the choices).
 *
 * @param responses one choice per item, aligned with items
 * @throws DesignInputError for mismatched lengths, unknown choices, a magnitude with no items,
 *   bad items, γ ≤ 0, ε outside [0, 1), or a threshold outside [0, 1]
 * @example estimateRates(Array(20).fill('SS'), calibrationItems({ model: { id: 'hyperbolic' } }), { id: 'hyperbolic' }).small.flags // ['all-sooner']
 */
export function estimateRates(
  responses: readonly Choice[],
  items: readonly CalibrationItem[],
  model: ModelSpec,
  options: EstimateOptions = {},
): RateEstimates {
  checkModel(model);
  if (!Array.isArray(items) || items.length === 0) throw new DesignInputError('items', 'a non-empty list of calibration items', items);
  if (!Array.isArray(responses) || responses.length !== items.length) {
    throw new DesignInputError('responses', `a list of ${items.length} choices, one per item`, Array.isArray(responses) ? responses.length : responses);
  }
  const gamma0 = options.sensitivity ?? 10;
  if (!(gamma0 > 0 && gamma0 < Infinity)) throw new DesignInputError('sensitivity', 'a finite number greater than 0', gamma0);
  const lapse = options.lapse ?? 0;
  if (!(lapse >= 0 && lapse < 1)) throw new DesignInputError('lapse', 'a number from 0 up to (not including) 1', lapse);
  const threshold = options.consistencyThreshold ?? 0.75;
  if (!(threshold >= 0 && threshold <= 1)) throw new DesignInputError('consistencyThreshold', 'a number from 0 to 1', threshold);
  const small = prepare('small', responses, items, model);
  const large = prepare('large', responses, items, model);
  let gamma = gamma0;
  if (options.estimateSensitivity) {
    const profile = (lnG: number) => fitOne(small, Math.exp(lnG), lapse).logLikelihood + fitOne(large, Math.exp(lnG), lapse).logLikelihood;
    gamma = Math.exp(maximiseBrent(profile, { lower: Math.log(0.5), upper: Math.log(500), tolerance: 1e-6 }).argmax);
  }
  return {
    small: finish(small, gamma, lapse, threshold),
    large: finish(large, gamma, lapse, threshold),
    sensitivity: gamma,
    sensitivityEstimated: options.estimateSensitivity === true,
  };
}

type Prepared = {
  id: ModelId;
  s: number;
  beta: number;
  S: Float64Array; // sooner amount / later amount
  d: Float64Array;
  D: Float64Array;
  later: boolean[];
  tie: Float64Array;
};

function prepare(magnitude: Magnitude, responses: readonly Choice[], items: readonly CalibrationItem[], model: ModelSpec): Prepared {
  const rows: number[] = [];
  items.forEach((item, i) => {
    if (item?.magnitude === magnitude) rows.push(i);
    else if (item?.magnitude !== 'small' && item?.magnitude !== 'large') throw new DesignInputError(`items[${i}].magnitude`, "'small' or 'large'", item?.magnitude);
  });
  if (rows.length === 0) throw new DesignInputError('items', `at least one item of ${magnitude} magnitude`, 0);
  const n = rows.length;
  const p: Prepared = { id: model.id, s: model.sensitivity ?? 1, beta: model.presentBias ?? 1, S: new Float64Array(n), d: new Float64Array(n), D: new Float64Array(n), later: [], tie: new Float64Array(n) };
  rows.forEach((row, j) => {
    const item = items[row];
    const r = responses[row];
    if (r !== 'SS' && r !== 'LL') throw new DesignInputError(`responses[${row}]`, "'SS' or 'LL'", r);
    p.tie[j] = indifferenceRate(model, item); // also validates the item's amounts and delays
    p.S[j] = item.soonerAmount / item.laterAmount;
    p.d[j] = item.soonerDelay ?? 0;
    p.D[j] = item.laterDelay;
    p.later.push(r === 'LL');
  });
  return p;
}

function logLikelihood(p: Prepared, lnK: number, gamma: number, lapse: number): number {
  const k = Math.exp(lnK);
  let sum = 0;
  for (let j = 0; j < p.S.length; j++) {
    const soon = p.d[j] === 0 ? 1 : discountAt(p.id, k, p.s, p.beta, p.d[j]); // f(0) = 1 for every model
    const gap = discountAt(p.id, k, p.s, p.beta, p.D[j]) - p.S[j] * soon;
    sum += logChoiceProbability(gamma, lapse, gap, p.later[j]);
  }
  return sum;
}

function fitOne(p: Prepared, gamma: number, lapse: number): { lnK: number; logLikelihood: number } {
  let best = 0;
  let bestValue = -Infinity;
  const step = (LOG_K_MAX - LOG_K_MIN) / (GRID - 1);
  for (let i = 0; i < GRID; i++) {
    const v = logLikelihood(p, LOG_K_MIN + i * step, gamma, lapse);
    if (v > bestValue) {
      bestValue = v;
      best = i;
    }
  }
  const lower = LOG_K_MIN + Math.max(0, best - 1) * step;
  const upper = LOG_K_MIN + Math.min(GRID - 1, best + 1) * step;
  const m = maximiseBrent((t) => logLikelihood(p, t, gamma, lapse), { lower, upper, tolerance: 1e-9, absoluteTolerance: 1e-8 });
  // ln k to ~1e-8: far below any standard error from ~20 binary choices.
  // Brent never evaluates the ends; a maximum at a bound is kept by comparing them explicitly
  let lnK = m.argmax;
  let value = m.value;
  for (const end of [lower, upper]) {
    const v = logLikelihood(p, end, gamma, lapse);
    if (v > value) {
      value = v;
      lnK = end;
    }
  }
  return { lnK, logLikelihood: value };
}

function finish(p: Prepared, gamma: number, lapse: number, threshold: number): RateEstimate {
  const flags: EstimateFlag[] = [];
  const n = p.S.length;
  const laterCount = p.later.filter(Boolean).length;
  let lnK: number;
  let value: number;
  if (laterCount === 0 || laterCount === n) {
    flags.push(laterCount === 0 ? 'all-sooner' : 'all-later');
    lnK = laterCount === 0 ? LOG_K_MAX : LOG_K_MIN;
    value = logLikelihood(p, lnK, gamma, lapse);
  } else {
    const fit = fitOne(p, gamma, lapse);
    lnK = fit.lnK;
    value = fit.logLikelihood;
    if (lnK - LOG_K_MIN < 1e-6 || LOG_K_MAX - lnK < 1e-6) flags.push('boundary');
  }
  if (consistency(p) < threshold) flags.push('non-monotone');
  let se: number | null = null;
  if (flags.every((f) => f === 'non-monotone')) {
    const h = 1e-3;
    const info = -(logLikelihood(p, lnK + h, gamma, lapse) - 2 * value + logLikelihood(p, lnK - h, gamma, lapse)) / (h * h);
    if (info > 0 && Number.isFinite(info)) se = 1 / Math.sqrt(info);
  }
  return {
    rate: Math.exp(lnK),
    logRate: lnK,
    standardErrorLog: se,
    interval: se === null ? null : { lower: Math.exp(lnK - Z975 * se), upper: Math.exp(lnK + Z975 * se) },
    flags,
    logLikelihood: value,
    itemCount: n,
  };
}

/** Largest share of choices a single switch point explains: LL on items tying above it, SS below. */
function consistency(p: Prepared): number {
  const n = p.S.length;
  const order = Array.from({ length: n }, (_, i) => i).sort((a, b) => p.tie[a] - p.tie[b]);
  // switch before position c: items order[0..c) should be SS, order[c..n) LL
  let agree = 0;
  for (let j = 0; j < n; j++) if (p.later[order[j]]) agree++;
  let best = agree;
  for (let c = 1; c <= n; c++) {
    agree += p.later[order[c - 1]] ? -1 : 1;
    if (agree > best) best = agree;
  }
  return best / n;
}
