import { checkChoiceModel, type ChoiceModel } from '../choiceProbability';
import { DesignInputError } from '../DesignInputError';
import { normalQuantile } from '../power/normalQuantile';
import { checkModel } from '../validate';
import type { ModelId, ModelSpec } from '../types';
import { choiceLogLikelihood, likelihoodScratch, packChoices, type FitChoice, type PackedChoices, type Theta } from './choiceLikelihood';
import type { ModelParameters } from './types';

/** An estimated parameter with its Wald interval. */
export type ParameterEstimate = {
  value: number;
  /** standard error on the log scale (ln k, ln s, ln β); null at a bound or when the information is singular */
  standardErrorLog: number | null;
  /** Wald interval exp(ln θ̂ ± z·SE) at the fit's confidence; null with the SE */
  interval: { lower: number; upper: number } | null;
  /** the estimate sits on a bound of its search range (see FIT_BOUNDS) */
  atBound: boolean;
};

/** A maximum-likelihood fit of one discount model to one participant's choices. */
export type ModelFit = {
  model: ModelId;
  parameters: ModelParameters;
  kSmall: ParameterEstimate;
  kLarge: ParameterEstimate;
  /** the free shape parameter (s or β) when the model has one and it was estimated; else null */
  shape: ({ name: 'sensitivity' | 'presentBias' } & ParameterEstimate) | null;
  logLikelihood: number;
  /** free parameters p */
  parameterCount: number;
  /** choices n */
  choiceCount: number;
  /** AIC = 2p − 2 ln L̂ (Akaike 1974, IEEE Trans Autom Control 19:716–723) */
  aic: number;
  /** BIC = p·ln n − 2 ln L̂ (Schwarz 1978, Ann Stat 6:461–464) */
  bic: number;
  converged: boolean;
  iterations: number;
};

export type FitOptions = {
  /** the model; with shape 'fixed' its sensitivity or presentBias (default 1) is held at the given value */
  model: ModelSpec;
  /** 'free' (default): estimate s or β where the model has one; 'fixed': hold it as given */
  shape?: 'free' | 'fixed';
  /** logistic choice model: γ (per unit of each item's later amount) and lapse ε, both held fixed */
  choice: ChoiceModel;
  /** confidence of the Wald intervals, strictly between 0 and 1; default 0.95 */
  confidence?: number;
  /** a further starting point (e.g. the fit to a subset of the same choices) */
  start?: ModelParameters;
  /** how many of the best grid starts Newton's method climbs from, 1 to 7; default 2 */
  gridStarts?: number;
};

/**
 * Search ranges: k and K in [1e-6, 10] per day (per day^s for power-delay and
 * exponential-power; the range estimateRates uses), s in [0.05, 5], β in [0.05, 1].
 */
export const FIT_BOUNDS = {
  rate: { lower: 1e-6, upper: 10 },
  sensitivity: { lower: 0.05, upper: 5 },
  presentBias: { lower: 0.05, upper: 1 },
} as const;

const SHAPED: Partial<Record<ModelId, 'sensitivity' | 'presentBias'>> = {
  hyperboloid: 'sensitivity',
  'power-delay': 'sensitivity',
  'exponential-power': 'sensitivity',
  'quasi-hyperbolic': 'presentBias',
};
const SHAPE_GRID = { sensitivity: [0.3, 0.5, 0.7, 1, 1.4, 2, 3], presentBias: [0.5, 0.6, 0.7, 0.8, 0.9, 1] } as const;
const MAX_STEP = 2; // largest move per iteration on the log scale: keeps early steps inside the likelihood's curved region

/**
 * Maximum-likelihood fit of a discount model (k for the small reward, K for the large, and the
 * delay sensitivity s or present bias β where the model has one) to binary choices under
 * logistic choice with a fixed γ and lapse (see choiceLogLikelihood).
 *
 * Method: a start from the best switch point of each magnitude's own choices for each of a few
 * shape values (see startingPoint),
 * then Newton's method on (ln k, ln K, ln s | ln β) with the analytic observed information,
 * falling back to Fisher scoring (the expected information; Cox & Hinkley 1974, §9.4) where the
 * observed one is not positive definite, with step halving, steps capped at 2 on the log scale,
 * and parameters at a bound of FIT_BOUNDS held there while the gradient points outwards.
 * Standard errors come from the inverse observed information over the parameters not at a
 * bound; intervals are Wald intervals on the log scale.
 *
 * @throws DesignInputError for a bad model, choice model or confidence, no choices, or a bad choice (field `choices[i].…`)
 * @example fitModel(choices, { model: { id: 'hyperbolic' }, choice: { sensitivity: 10 } }).parameterCount // 2
 */
export function fitModel(choices: readonly FitChoice[] | PackedChoices, options: FitOptions): ModelFit {
  const { model, choice } = options ?? ({} as FitOptions);
  checkModel(model);
  checkChoiceModel(choice);
  const confidence = options.confidence ?? 0.95;
  if (!(confidence > 0 && confidence < 1)) throw new DesignInputError('confidence', 'a number strictly between 0 and 1', confidence);
  const data = Array.isArray(choices) ? packChoices(choices) : (choices as PackedChoices);
  if (!(data.n > 0)) throw new DesignInputError('choices', 'at least one choice', data.n);
  const shapeName = SHAPED[model.id] ?? null;
  const freeShape = shapeName !== null && (options.shape ?? 'free') === 'free';
  const fixedShape = shapeName === 'sensitivity' ? (model.sensitivity ?? 1) : shapeName === 'presentBias' ? (model.presentBias ?? 1) : 1;
  const gamma = choice.sensitivity;
  const lapse = choice.lapse ?? 0;
  const bounds = boundsFor(shapeName, freeShape, fixedShape);
  const free = [true, true, freeShape];

  // Newton's method from the best grid starts (and the given start), keeping the best ascent
  const gridStarts = options.gridStarts ?? 2;
  if (!(Number.isInteger(gridStarts) && gridStarts >= 1 && gridStarts <= 7)) throw new DesignInputError('gridStarts', 'a whole number from 1 to 7', gridStarts);
  const starts = startingPoints(model.id, data, gamma, lapse, shapeName, freeShape, fixedShape).slice(0, gridStarts);
  if (options.start) starts.unshift(fromParameters(options.start, shapeName, freeShape, fixedShape, bounds));
  let outcome: Climb | null = null;
  for (const start of starts) {
    const run = climb(model.id, data, start, gamma, lapse, free, bounds);
    if (outcome === null || run.value > outcome.value + 1e-9) outcome = run;
  }
  const { theta, value, converged, iterations } = outcome!;

  const z = normalQuantile(1 - (1 - confidence) / 2);
  const atBound = theta.map((t, j) => free[j] && (t - bounds[j].lower < 1e-6 || bounds[j].upper - t < 1e-6));
  const se = standardErrors(model.id, data, theta, gamma, lapse, free.map((f, j) => f && !atBound[j]));
  const estimate = (j: number, cap = Infinity): ParameterEstimate => ({
    value: Math.exp(theta[j]),
    standardErrorLog: se[j],
    interval: se[j] === null ? null : { lower: Math.exp(theta[j] - z * se[j]!), upper: Math.min(cap, Math.exp(theta[j] + z * se[j]!)) },
    atBound: atBound[j],
  });
  const p = freeShape ? 3 : 2;
  const shapeValue = freeShape ? Math.exp(theta[2]) : fixedShape;
  return {
    model: model.id,
    parameters: {
      kSmall: Math.exp(theta[0]),
      kLarge: Math.exp(theta[1]),
      sensitivity: shapeName === 'sensitivity' ? shapeValue : 1,
      presentBias: shapeName === 'presentBias' ? shapeValue : 1,
    },
    kSmall: estimate(0),
    kLarge: estimate(1),
    shape: freeShape ? { name: shapeName!, ...estimate(2, shapeName === 'presentBias' ? 1 : Infinity) } : null,
    logLikelihood: value,
    parameterCount: p,
    choiceCount: data.n,
    aic: 2 * p - 2 * value,
    bic: p * Math.log(data.n) - 2 * value,
    converged,
    iterations,
  };
}

type Range = { lower: number; upper: number };

type Climb = { theta: Theta; value: number; converged: boolean; iterations: number };

/** Newton ascent from one start (see fitModel). */
function climb(id: ModelId, data: PackedChoices, start: Theta, gamma: number, lapse: number, free: boolean[], bounds: Range[]): Climb {
  const theta: Theta = [start[0], start[1], start[2]];
  const scratch = likelihoodScratch();
  let value = choiceLogLikelihood(id, data, theta, gamma, lapse, scratch);
  let converged = false;
  let iterations = 0;
  const candidate: Theta = [0, 0, 0];
  let step: Theta = [0, 0, 0];
  const trial = (t: number): number => {
    for (let j = 0; j < 3; j++) candidate[j] = clamp(theta[j] + t * step[j], bounds[j]);
    return choiceLogLikelihood(id, data, candidate, gamma, lapse);
  };
  for (; iterations < 200 && !converged; iterations++) {
    const active = free.map((f, j) => f && !pinned(theta[j], scratch.gradient[j], bounds[j]));
    let snapped = false;
    for (let j = 0; j < 3; j++) {
      if (!free[j] || active[j]) continue;
      const edge = theta[j] < 0.5 * (bounds[j].lower + bounds[j].upper) ? bounds[j].lower : bounds[j].upper;
      if (edge !== theta[j]) {
        theta[j] = edge;
        snapped = true;
      }
    }
    if (snapped) value = choiceLogLikelihood(id, data, theta, gamma, lapse, scratch);
    // Newton's step on the observed information where it is positive definite, else Fisher scoring
    step = solve(scratch.observed, scratch.gradient, active) ?? solve(scratch.information, scratch.gradient, active) ?? [0, 0, 0];
    let largest = 0;
    for (let j = 0; j < 3; j++) largest = Math.max(largest, Math.abs(step[j]));
    if (largest > MAX_STEP) for (let j = 0; j < 3; j++) step[j] *= MAX_STEP / largest;
    // step halving until the likelihood rises; a full step that rises is stretched (×2, up to
    // ×64) while it keeps rising, which walks along a flat ridge in a few iterations
    let best = -Infinity;
    let bestT = 0;
    for (let t = 1, tries = 0; tries < 40; t /= 2, tries++) {
      const v = trial(t);
      if (v > value) {
        best = v;
        bestT = t;
        break;
      }
    }
    if (bestT === 1) {
      for (let t = 2; t <= 64; t *= 2) {
        const v = trial(t);
        if (!(v > best)) break;
        best = v;
        bestT = t;
      }
    }
    const accepted = bestT > 0;
    if (accepted) {
      trial(bestT);
      const moved = Math.max(Math.abs(candidate[0] - theta[0]), Math.abs(candidate[1] - theta[1]), Math.abs(candidate[2] - theta[2]));
      const gain = best - value;
      theta[0] = candidate[0];
      theta[1] = candidate[1];
      theta[2] = candidate[2];
      value = choiceLogLikelihood(id, data, theta, gamma, lapse, scratch);
      if (moved < 1e-7 || gain < 1e-11) converged = true;
    }
    // no ascent along the scoring direction: a (constrained) maximum to working precision
    if (!accepted) converged = true;
    else if (projectedGradient(theta, scratch.gradient, free, bounds) < 1e-7) converged = true;
  }

  return { theta, value, converged, iterations };
}


function fromParameters(p: ModelParameters, shapeName: 'sensitivity' | 'presentBias' | null, freeShape: boolean, fixedShape: number, bounds: Range[]): Theta {
  const shape = freeShape && shapeName ? p[shapeName] : fixedShape;
  const values = [p.kSmall, p.kLarge, shape];
  values.forEach((v, j) => {
    if (!(v > 0 && v < Infinity)) throw new DesignInputError(`start.${['kSmall', 'kLarge', shapeName ?? 'shape'][j]}`, 'a finite number greater than 0', v);
  });
  return [clamp(Math.log(values[0]), bounds[0]), clamp(Math.log(values[1]), bounds[1]), clamp(Math.log(values[2]), bounds[2])];
}

function boundsFor(shapeName: 'sensitivity' | 'presentBias' | null, freeShape: boolean, fixedShape: number): [Range, Range, Range] {
  const rate = { lower: Math.log(FIT_BOUNDS.rate.lower), upper: Math.log(FIT_BOUNDS.rate.upper) };
  const fixed = Math.log(fixedShape);
  const shape = !freeShape || shapeName === null ? { lower: fixed, upper: fixed } : { lower: Math.log(FIT_BOUNDS[shapeName].lower), upper: Math.log(FIT_BOUNDS[shapeName].upper) };
  return [rate, rate, shape];
}

function clamp(v: number, r: Range): number {
  return v < r.lower ? r.lower : v > r.upper ? r.upper : v;
}

/** A parameter on a bound whose gradient points out of the range stays there this step. */
function pinned(v: number, gradient: number, r: Range): boolean {
  // within 1e-7 on the log scale counts as on the bound: a halved step can stop just short of it
  return (v <= r.lower + 1e-7 && gradient <= 0) || (v >= r.upper - 1e-7 && gradient >= 0);
}

function projectedGradient(theta: Theta, g: Float64Array, free: boolean[], bounds: Range[]): number {
  let largest = 0;
  for (let j = 0; j < 3; j++) if (free[j] && !pinned(theta[j], g[j], bounds[j])) largest = Math.max(largest, Math.abs(g[j]));
  return largest;
}

/**
 * Solves I_AA·δ_A = g_A over the active parameters by Cholesky, with a ridge of 1e-9 of the
 * largest diagonal (so a direction the choices do not inform takes a gradient step instead of
 * an infinite one); null when I_AA is not positive definite.
 */
function solve(info: Float64Array, g: Float64Array, active: boolean[]): Theta | null {
  const idx = [0, 1, 2].filter((j) => active[j]);
  const m = idx.length;
  const out: Theta = [0, 0, 0];
  if (m === 0) return out;
  let scale = 0;
  for (const j of idx) scale = Math.max(scale, info[j * 4]);
  const ridge = 1e-9 * scale + 1e-12;
  const a = idx.map((r) => idx.map((c) => info[r * 3 + c] + (r === c ? ridge : 0)));
  const b = idx.map((r) => g[r]);
  const x = choleskySolve(a, b);
  if (x === null) return null;
  idx.forEach((j, i) => (out[j] = x[i]));
  return out;
}

/** Solves A·x = b for a small symmetric positive definite A; null when A is not positive definite. */
function choleskySolve(a: number[][], b: number[]): number[] | null {
  const m = a.length;
  const l = a.map(() => new Array<number>(m).fill(0));
  for (let i = 0; i < m; i++) {
    for (let j = 0; j <= i; j++) {
      let sum = a[i][j];
      for (let k = 0; k < j; k++) sum -= l[i][k] * l[j][k];
      if (i === j) {
        if (!(sum > 0)) return null;
        l[i][i] = Math.sqrt(sum);
      } else l[i][j] = sum / l[j][j];
    }
  }
  const y = new Array<number>(m);
  for (let i = 0; i < m; i++) {
    let sum = b[i];
    for (let k = 0; k < i; k++) sum -= l[i][k] * y[k];
    y[i] = sum / l[i][i];
  }
  const x = new Array<number>(m);
  for (let i = m - 1; i >= 0; i--) {
    let sum = y[i];
    for (let k = i + 1; k < m; k++) sum -= l[k][i] * x[k];
    x[i] = sum / l[i][i];
  }
  return x;
}

/** Inverse of a small symmetric positive definite matrix by solving for each unit vector; null when not positive definite. */
function inverse(a: number[][]): number[][] | null {
  const m = a.length;
  const columns: number[][] = [];
  for (let j = 0; j < m; j++) {
    const x = choleskySolve(a, a.map((_, i) => (i === j ? 1 : 0)));
    if (x === null) return null;
    columns.push(x);
  }
  return columns;
}

function standardErrors(id: ModelId, data: PackedChoices, theta: Theta, gamma: number, lapse: number, use: boolean[]): Array<number | null> {
  const idx = [0, 1, 2].filter((j) => use[j]);
  const out: Array<number | null> = [null, null, null];
  if (idx.length === 0) return out;
  const scratch = likelihoodScratch();
  choiceLogLikelihood(id, data, theta, gamma, lapse, scratch);
  const covariance = inverse(idx.map((r) => idx.map((c) => scratch.observed[r * 3 + c])));
  if (covariance === null) return out;
  idx.forEach((j, r) => {
    const variance = covariance[r][r];
    out[j] = variance > 0 && Number.isFinite(variance) ? Math.sqrt(variance) : null;
  });
  return out;
}

/**
 * Start: for each shape value on a grid, each magnitude's rate from the best single switch point
 * among its own "sooner today or later" choices (the choices that involve one magnitude only):
 * items are ordered by the rate at which the chooser would be indifferent, and the start lies
 * between the two tie rates where switching from SS to LL agrees with most choices. This finds
 * the sharp peak of a low-noise likelihood, which a coarse rate grid can miss, and avoids the
 * flat regions (all factors ≈ 0 or ≈ 1) where Newton's method cannot move. The two shape
 * values are returned best first (fitModel climbs from `gridStarts` of them).
 */
function startingPoints(
  id: ModelId,
  data: PackedChoices,
  gamma: number,
  lapse: number,
  shapeName: 'sensitivity' | 'presentBias' | null,
  freeShape: boolean,
  fixedShape: number,
): Theta[] {
  const shapes = freeShape && shapeName ? SHAPE_GRID[shapeName] : [fixedShape];
  const middle = Math.log(0.01); // used only for a magnitude with no choices of its own
  const scored = shapes.map((shape) => {
    const theta: Theta = [switchRate(id, data, 0, shape) ?? middle, switchRate(id, data, 1, shape) ?? middle, Math.log(shape)];
    return { theta, value: choiceLogLikelihood(id, data, theta, gamma, lapse) };
  });
  scored.sort((a, b) => b.value - a.value);
  return scored.map((s) => s.theta);
}

/** Tie rate of "S today or L after D days" (closed forms as in indifferenceRate); null when no rate ties. */
function tieRate(id: ModelId, share: number, D: number, shape: number): number | null {
  const r = 1 / share;
  switch (id) {
    case 'exponential':
      return Math.log(r) / D;
    case 'hyperbolic':
      return (r - 1) / D;
    case 'hyperboloid':
      return Math.expm1(Math.log(r) / shape) / D;
    case 'power-delay':
      return (r - 1) / Math.pow(D, shape);
    case 'exponential-power':
      return Math.log(r) / Math.pow(D, shape);
    case 'quasi-hyperbolic':
      return shape * r > 1 ? Math.log(shape * r) / D : null;
  }
}

function switchRate(id: ModelId, data: PackedChoices, magnitude: 0 | 1, shape: number): number | null {
  const ties: Array<[number, number]> = [];
  for (let i = 0; i < data.n; i++) {
    if (data.soonMagnitude[i] !== magnitude || data.lateMagnitude[i] !== magnitude || data.soonDelay[i] !== 0) continue;
    const t = tieRate(id, data.share[i], data.lateDelay[i], shape);
    if (t !== null && t > 0 && Number.isFinite(t)) ties.push([t, data.later[i]]);
  }
  if (ties.length === 0) return null;
  ties.sort((a, b) => a[0] - b[0]);
  // a rate between ties[c − 1] and ties[c] predicts SS for items 0..c−1 and LL for c..n−1
  let agree = 0;
  for (const [, later] of ties) agree += later;
  let bestAgree = agree;
  let first = 0;
  let last = 0;
  for (let c = 1; c <= ties.length; c++) {
    agree += ties[c - 1][1] === 1 ? -1 : 1;
    if (agree > bestAgree) {
      bestAgree = agree;
      first = c;
      last = c;
    } else if (agree === bestAgree) last = c;
  }
  const c = Math.round((first + last) / 2);
  const below = c === 0 ? ties[0][0] / 4 : ties[c - 1][0];
  const above = c === ties.length ? ties[ties.length - 1][0] * 4 : ties[c][0];
  const lnRate = 0.5 * (Math.log(below) + Math.log(above));
  return Math.min(Math.log(FIT_BOUNDS.rate.upper), Math.max(Math.log(FIT_BOUNDS.rate.lower), lnRate));
}
