import { checkChoiceModel, checkPrior, type ChoiceModel, type RatePrior } from '@/lib/design';

/** The error target of expected reversal rates computed on a prior's quadrature nodes: absolute. */
export const EXPECTED_RATE_TARGET = 1e-4;

/**
 * Nodes per axis of the tensor Gauss–Hermite rule, by sharpness h = γ·max(σ_small, σ_large): the
 * smallest count meeting half the target (5e-5) on every reference case of that sharpness, from
 * tests/unit/criteria/fixtures/generate.py (trapezoid-rule references on a fine grid; seven models,
 * two priors, three late delays). A count serves every h up to its row.
 */
const NODES_BY_SHARPNESS: ReadonlyArray<readonly [number, number]> = [
  [4, 12],
  [8, 16],
  [12, 24],
  [16, 40],
  [20, 64],
  [24, 64],
  [28, 80],
];
/** Beyond the table: the count whose error at h = 28 was already 4e-6 (claimed only within the table). */
const BEYOND_TABLE = 128;

/**
 * How many Gauss–Hermite nodes per axis (priorPoints with method 'quadrature') keep
 * expectedReversalRate within 1e-4 absolute of the exact expectation over a log-normal prior.
 *
 * The integrand σ(γA)·σ(γB) turns from 0 to 1 over a band of ln k about 1/(γ·|∂A/∂ln K|) wide, and
 * |∂A/∂ln K| ≤ 1/e for every model here, so the rule's error is governed by the sharpness
 * h = γ·max(sdLogSmall, sdLogLarge): with 12 nodes it is below 1e-5 at h = 4 but reaches 2.7e-3 at
 * h = 16 (γ = 20, σ = 0.8, an ordinary planning prior). Counts come from a table checked against
 * fine-grid references (see NODES_BY_SHARPNESS); the count grows about as h², because
 * Gauss–Hermite spreads its nodes over ±√(2n) rather than into the transition bands.
 *
 * Monte Carlo instead of quadrature: the expectation of a share has a standard deviation of at most
 * 1/2, so 1e-4 would take 2.5·10^7 draws; Monte Carlo points suit charts, not this target.
 *
 * @returns `nodes`, the sharpness h, and `withinTarget` false when h is beyond the table (h > 28,
 *   e.g. γ = 40 with σ = 0.8): then 128 nodes, whose error is not checked there and may exceed the
 *   target, so callers should say so (the planner shows a warning)
 * @throws DesignInputError for a bad prior or choice model
 * @example expectedRateNodes({ choice: { sensitivity: 20 }, prior: { medianSmall: 0.02, medianLarge: 0.008, sdLogSmall: 0.8, sdLogLarge: 0.8, correlation: 0.6 } }).nodes // 40
 */
export function expectedRateNodes(options: { choice: ChoiceModel; prior: RatePrior }): { nodes: number; sharpness: number; withinTarget: boolean } {
  checkChoiceModel(options.choice);
  checkPrior(options.prior);
  const { sdLogSmall, sdLogLarge } = options.prior;
  const sharpness = options.choice.sensitivity * Math.max(sdLogSmall, sdLogLarge);
  for (const [upTo, nodes] of NODES_BY_SHARPNESS) {
    if (sharpness <= upTo) return { nodes, sharpness, withinTarget: true };
  }
  return { nodes: BEYOND_TABLE, sharpness, withinTarget: false };
}
