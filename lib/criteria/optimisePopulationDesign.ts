import { checkInteger, checkModel, checkRatio, DesignInputError, discriminationAt, maximiseBrent, type ChoiceModel, type ModelSpec, type RatePoints } from '@/lib/design';
import { expectedReversalRate } from './expectedReversalRate';
import { gapProduct } from './gapProduct';
import { maximinGap } from './maximinGap';
import { modelDiscrimination } from './modelDiscrimination';
import { checkChoiceModel, checkPoints } from './pairSetting';

export type PopulationCriterion =
  | { kind: 'expected-reversal-rate'; choice: ChoiceModel; points: RatePoints }
  | { kind: 'maximin-gap'; scenarios: readonly { kSmall: number; kLarge: number }[] }
  | { kind: 'gap-product'; kSmall: number; kLarge: number }
  /** hyperbolic-vs-exponential divergence at one rate pair plus the weighted reversal term (modelDiscrimination) */
  | { kind: 'model-discrimination'; kSmall: number; kLarge: number; choice: ChoiceModel; reversalWeight?: number };

export type PopulationDesignOptions = {
  model: ModelSpec;
  ratio: number;
  criterion: PopulationCriterion;
  /** soon delay bounds, days; default 0 to 365 */
  soonDelay?: { min: number; max: number };
  /** largest late delay, days; default 9131 (25 years) */
  lateDelayMax?: number;
  /** smallest D − d, days; default 1 */
  minSeparation?: number;
  /** grid points for d (log(1 + d) spaced) and for D − d (log spaced); default 16 × 32 */
  grid?: { soon: number; late: number };
  /** rounds of coordinate-wise Brent refinement; default 4 */
  refinementRounds?: number;
};

export type PopulationDesign = { soonDelay: number; lateDelay: number; value: number; gridValue: number; evaluations: number };

/**
 * Soon and late delays (days) for a whole population that maximise a criterion within bounds:
 * the expected reversal rate over prior points, the maximin gap over scenarios, or the gap
 * product or the model-discrimination criterion at one rate pair. Method: a grid over ln(1 + d) and ln(D − d) (every D ≤ lateDelayMax,
 * D − d ≥ minSeparation), then coordinate-wise Brent maximisation (in ln(1 + d) with D fixed,
 * then in ln(D − d) with d fixed) inside the neighbouring grid cells, halving the search
 * window each round. Monte Carlo points are held fixed (common random numbers), so the
 * criterion is deterministic. The result is a local refinement of the best grid point;
 * `gridValue` is the best grid value, never more than `value`.
 *
 * @throws DesignInputError for a bad model, ratio, criterion, bounds, grid or rounds
 * @example optimisePopulationDesign({ model: { id: 'hyperbolic' }, ratio: 0.5, criterion: { kind: 'gap-product', kSmall: 0.1, kLarge: 0.05 }, soonDelay: { min: 10, max: 10 } }).lateDelay // ≈ 41.222, optimiseLateDelay's closed form
 */
export function optimisePopulationDesign(options: PopulationDesignOptions): PopulationDesign {
  const { model, ratio, criterion } = options;
  checkModel(model);
  checkRatio(ratio);
  const soon = options.soonDelay ?? { min: 0, max: 365 };
  if (!(soon?.min >= 0 && soon.min < Infinity)) throw new DesignInputError('soonDelay.min', 'a finite number of days, 0 or more', soon?.min);
  if (!(soon.max >= soon.min && soon.max < Infinity)) throw new DesignInputError('soonDelay.max', `a finite number of days, at least soonDelay.min (${soon.min})`, soon.max);
  const minSep = options.minSeparation ?? 1;
  if (!(minSep > 0 && minSep < Infinity)) throw new DesignInputError('minSeparation', 'a finite number of days greater than 0', minSep);
  const lateMax = options.lateDelayMax ?? 9131;
  if (!(lateMax >= soon.min + minSep && lateMax < Infinity)) throw new DesignInputError('lateDelayMax', `a finite number of days, at least soonDelay.min + minSeparation (${soon.min + minSep})`, lateMax);
  const grid = options.grid ?? { soon: 16, late: 32 };
  checkInteger('grid.soon', grid?.soon, 1, 1000);
  checkInteger('grid.late', grid.late, 2, 1000);
  const rounds = options.refinementRounds ?? 4;
  checkInteger('refinementRounds', rounds, 0, 50);
  const evaluate = criterionFunction(model, ratio, criterion);
  let evaluations = 0;
  // expm1(log1p(d)) and d + exp(ln(D − d)) can round a hair past a bound: clamp them back
  const soonAt = (u: number) => Math.min(soon.max, Math.max(soon.min, Math.expm1(u)));
  const lateAt = (d: number, v: number) => Math.min(lateMax, Math.max(d + minSep, d + Math.exp(v)));
  const value = (d: number, D: number) => {
    evaluations++;
    return evaluate(d, D);
  };

  const uLo = Math.log1p(soon.min);
  const uHi = Math.log1p(Math.min(soon.max, lateMax - minSep));
  const du = grid.soon > 1 ? (uHi - uLo) / (grid.soon - 1) : 0;
  let best = { d: soon.min, D: soon.min + minSep, value: -Infinity };
  let dv = 0;
  for (let i = 0; i < grid.soon; i++) {
    const d = soonAt(uLo + i * du);
    const vLo = Math.log(minSep);
    const vHi = Math.log(lateMax - d);
    const step = (vHi - vLo) / (grid.late - 1);
    dv = Math.max(dv, step);
    for (let j = 0; j < grid.late; j++) {
      const D = lateAt(d, vLo + j * step);
      const c = value(d, D);
      if (c > best.value) best = { d, D, value: c };
    }
  }
  const gridValue = best.value;
  let wu = du;
  let wv = dv;
  for (let round = 0; round < rounds; round++) {
    // late delay with the soon delay fixed, in v = ln(D − d)
    const v0 = Math.log(best.D - best.d);
    const vLo = Math.max(Math.log(minSep), v0 - wv);
    const vHi = Math.min(Math.log(lateMax - best.d), v0 + wv);
    if (vHi > vLo) {
      const m = maximiseBrent((v) => value(best.d, lateAt(best.d, v)), { lower: vLo, upper: vHi, tolerance: 1e-9 });
      if (m.value > best.value) best = { d: best.d, D: lateAt(best.d, m.argmax), value: m.value };
    }
    // soon delay with the late delay fixed, in u = ln(1 + d)
    const u0 = Math.log1p(best.d);
    const uL = Math.max(uLo, u0 - wu);
    const uH = Math.min(Math.log1p(Math.min(soon.max, best.D - minSep)), u0 + wu);
    if (uH > uL) {
      const D = best.D;
      const m = maximiseBrent((u) => value(soonAt(u), D), { lower: uL, upper: uH, tolerance: 1e-9 });
      if (m.value > best.value) best = { d: soonAt(m.argmax), D, value: m.value };
    }
    wu /= 2;
    wv /= 2;
  }
  return { soonDelay: best.d, lateDelay: best.D, value: best.value, gridValue, evaluations };
}

function criterionFunction(model: ModelSpec, ratio: number, criterion: PopulationCriterion): (d: number, D: number) => number {
  switch (criterion?.kind) {
    case 'expected-reversal-rate': {
      checkChoiceModel(criterion.choice, 'criterion.choice');
      checkPoints(criterion.points);
      const { choice, points } = criterion;
      return (d, D) => expectedReversalRate({ model, ratio, soonDelay: d, lateDelay: D, choice, points });
    }
    case 'maximin-gap': {
      const scenarios = criterion.scenarios;
      maximinGap({ model, ratio, soonDelay: 1, lateDelay: 2, scenarios }); // validates the scenarios once
      return (d, D) => maximinGap({ model, ratio, soonDelay: d, lateDelay: D, scenarios });
    }
    case 'gap-product': {
      const { kSmall, kLarge } = criterion;
      if (!(kSmall > 0 && kSmall < Infinity)) throw new DesignInputError('criterion.kSmall', 'a finite rate greater than 0 (per day)', kSmall);
      if (!(kLarge > 0 && kLarge < Infinity)) throw new DesignInputError('criterion.kLarge', 'a finite rate greater than 0 (per day)', kLarge);
      return (d, D) => gapProduct({ model, ratio, soonDelay: d, lateDelay: D, kSmall, kLarge });
    }
    case 'model-discrimination': {
      const { kSmall, kLarge, choice } = criterion;
      const w = criterion.reversalWeight ?? 0;
      // validates rates, choice model and weight once; the loop runs unchecked
      modelDiscrimination({ model, ratio, soonDelay: 1, lateDelay: 2, kSmall, kLarge, choice, reversalWeight: w });
      const gamma = choice.sensitivity;
      const lapse = choice.lapse ?? 0;
      return (d, D) => discriminationAt(model, ratio, d, D, kSmall, kLarge, gamma, lapse, w).value;
    }
    default:
      throw new DesignInputError('criterion.kind', "'expected-reversal-rate', 'maximin-gap', 'gap-product' or 'model-discrimination'", (criterion as { kind?: unknown })?.kind);
  }
}
