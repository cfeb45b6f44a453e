import { DesignInputError } from '../DesignInputError';
import { checkPrior, type RatePrior } from '../ratePrior';
import { checkInteger, checkModel } from '../validate';
import type { ModelSpec } from '../types';

/** Models whose discount function has a delay sensitivity s (docs/mathematics.md, "Discount models"). */
const MODELS_WITH_SENSITIVITY = new Set(['hyperboloid', 'power-delay', 'exponential-power']);

/** The grid of a rate posterior: ln k, ln K and (for models with s) ln s, each on equally spaced nodes. */
export type RateGrid = {
  model: ModelSpec;
  /** nodes of ln k (small reward), ascending */
  logSmall: Float64Array;
  /** nodes of ln K (large reward), ascending */
  logLarge: Float64Array;
  /** nodes of ln s; one node at ln(model s) for models without delay sensitivity */
  logSensitivity: Float64Array;
  /** log prior density (unnormalised) at node (i, j, m), index (i·nK + j)·ns + m */
  logPrior: Float64Array;
};

export type RateGridOptions = {
  model: ModelSpec;
  /** the study's prior of (ln k, ln K) */
  prior: RatePrior;
  /** nodes per rate axis, 5 to 200; default 40 */
  rateNodes?: number;
  /** half-width of each rate axis in prior SDs, 2 to 8; default 4 */
  span?: number;
  /**
   * prior of the delay sensitivity s for models that have it: log-normal with this median and SD of
   * ln s (default: the model's s, or 1, and 0.25), on `nodes` nodes (2 to 50; default 10) across
   * ±span SDs of ln s. Ignored for models without s.
   */
  sensitivity?: { median?: number; sdLog?: number; nodes?: number };
};

/**
 * Smallest log-scale SD a grid axis uses: a prior that claims to know a rate (SD 0) is widened
 * to it, so the answers can still move the estimate (ours: 0.1 in ln k is ±10 % in k).
 */
export const MIN_GRID_SD = 0.1;
/** Largest |correlation| the grid prior uses: ±1 would make the bivariate normal singular. */
export const MAX_GRID_CORRELATION = 0.99;

/**
 * The grid a participant's posterior lives on (docs/mathematics.md, "Adaptive calibration"):
 * ln k and ln K each on `rateNodes` equally spaced nodes across the prior mean ± span·SD, the
 * prior density the study's bivariate normal of (ln k, ln K) (SDs at least MIN_GRID_SD,
 * |ρ| at most MAX_GRID_CORRELATION); for models with a delay sensitivity, ln s on its own
 * nodes with an independent normal prior. Densities are evaluated at the nodes (a product
 * rule with equal cells, so the cell size cancels on normalising).
 *
 * @throws DesignInputError naming the field (model, prior.*, rateNodes, span, sensitivity.*)
 * @example rateGrid({ model: { id: 'hyperbolic' }, prior: { medianSmall: 0.02, medianLarge: 0.01, sdLogSmall: 1, sdLogLarge: 1, correlation: 0.5 } }).logSmall.length // 40
 */
export function rateGrid(options: RateGridOptions): RateGrid {
  const { model, prior } = options;
  checkModel(model);
  checkPrior(prior);
  const nodes = options.rateNodes ?? 40;
  checkInteger('rateNodes', nodes, 5, 200);
  const span = options.span ?? 4;
  if (!(span >= 2 && span <= 8)) throw new DesignInputError('span', 'a number from 2 to 8 (prior SDs)', span);
  const sdSmall = Math.max(prior.sdLogSmall, MIN_GRID_SD);
  const sdLarge = Math.max(prior.sdLogLarge, MIN_GRID_SD);
  const rho = Math.max(-MAX_GRID_CORRELATION, Math.min(MAX_GRID_CORRELATION, prior.correlation));
  const muSmall = Math.log(prior.medianSmall);
  const muLarge = Math.log(prior.medianLarge);
  const logSmall = axis(muSmall, sdSmall, span, nodes);
  const logLarge = axis(muLarge, sdLarge, span, nodes);

  let logSensitivity: Float64Array;
  let sdS = 1;
  let muS = 0;
  if (MODELS_WITH_SENSITIVITY.has(model.id)) {
    const median = options.sensitivity?.median ?? model.sensitivity ?? 1;
    if (!(median > 0 && median < Infinity)) throw new DesignInputError('sensitivity.median', 'a finite number greater than 0', median);
    sdS = options.sensitivity?.sdLog ?? 0.25;
    if (!(sdS > 0 && sdS <= 2)) throw new DesignInputError('sensitivity.sdLog', 'a number above 0 and at most 2', sdS);
    const count = options.sensitivity?.nodes ?? 10;
    checkInteger('sensitivity.nodes', count, 2, 50);
    muS = Math.log(median);
    logSensitivity = axis(muS, sdS, span, count);
  } else {
    logSensitivity = Float64Array.of(Math.log(model.sensitivity ?? 1));
  }

  const nk = logSmall.length;
  const nK = logLarge.length;
  const ns = logSensitivity.length;
  const logPrior = new Float64Array(nk * nK * ns);
  const oneMinus = 1 - rho * rho;
  for (let i = 0; i < nk; i++) {
    const a = (logSmall[i] - muSmall) / sdSmall;
    for (let j = 0; j < nK; j++) {
      const b = (logLarge[j] - muLarge) / sdLarge;
      const rates = -(a * a - 2 * rho * a * b + b * b) / (2 * oneMinus);
      for (let m = 0; m < ns; m++) {
        const c = ns === 1 ? 0 : (logSensitivity[m] - muS) / sdS;
        logPrior[(i * nK + j) * ns + m] = rates - 0.5 * c * c;
      }
    }
  }
  return { model, logSmall, logLarge, logSensitivity, logPrior };
}

function axis(mu: number, sd: number, span: number, count: number): Float64Array {
  const out = new Float64Array(count);
  for (let i = 0; i < count; i++) out[i] = mu - span * sd + (2 * span * sd * i) / (count - 1);
  return out;
}

/** Posterior quantiles and spread of one parameter on the log scale. */
export type LogSummary = {
  /** posterior median of ln θ */
  median: number;
  /** posterior mean of ln θ */
  mean: number;
  /** posterior SD of ln θ */
  sd: number;
  /** central 95 % posterior interval of ln θ (2.5 % and 97.5 % quantiles) */
  lower: number;
  upper: number;
};

/**
 * Summary of a marginal posterior on equally spaced nodes x (weights w summing to 1). Mean and
 * SD are the node sums; quantiles read the cumulative distribution with each node's mass spread
 * evenly over its cell (node ± half a step), so they move smoothly between nodes.
 */
export function summariseMarginal(x: Float64Array, w: Float64Array): LogSummary {
  const n = x.length;
  let mean = 0;
  for (let i = 0; i < n; i++) mean += w[i] * x[i];
  let variance = 0;
  for (let i = 0; i < n; i++) variance += w[i] * (x[i] - mean) * (x[i] - mean);
  if (n === 1) return { median: x[0], mean: x[0], sd: 0, lower: x[0], upper: x[0] };
  const h = x[1] - x[0];
  const quantile = (q: number): number => {
    let cumulative = 0;
    for (let i = 0; i < n; i++) {
      if (cumulative + w[i] >= q && w[i] > 0) return x[i] - h / 2 + (h * (q - cumulative)) / w[i];
      cumulative += w[i];
    }
    return x[n - 1] + h / 2;
  };
  return { median: quantile(0.5), mean, sd: Math.sqrt(variance), lower: quantile(0.025), upper: quantile(0.975) };
}
