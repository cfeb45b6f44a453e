import { DesignInputError } from '../DesignInputError';
import type { ModelId, ModelSpec } from '../types';
import type { PowerScenario, PowerTruth } from './types';

/**
 * A stress truth: a named deviation of the simulated truth from the one the design assumes.
 * - 'delay-sensitivity': each participant's delay sensitivity s is drawn uniformly from
 *   [low, high] (below 1: later delays are discounted less steeply than the model assumes),
 *   under the model of the assumed truth's family that has an s (exponential family:
 *   exponential with delay sensitivity; hyperbolic and power-delay: power-delay hyperbola;
 *   hyperboloid: hyperboloid);
 * - 'no-magnitude-effect': each participant discounts the large reward at their small-reward rate (K = k);
 * - 'present-bias': every delayed value is multiplied by β (0 < β < 1), an immediate one is not;
 * - 'choice-noise': choice sensitivity γ multiplied by `factor` (0 < factor < 1: noisier choices);
 * - 'other-model': hyperbolic (Mazur) when the assumed truth is of the exponential family, else exponential (Samuelson).
 */
export type StressTruth =
  | { kind: 'delay-sensitivity'; low: number; high: number }
  | { kind: 'no-magnitude-effect' }
  | { kind: 'present-bias'; beta: number }
  | { kind: 'choice-noise'; factor: number }
  | { kind: 'other-model' };

export type StressKind = StressTruth['kind'];
export const STRESS_KINDS: readonly StressKind[] = ['delay-sensitivity', 'no-magnitude-effect', 'present-bias', 'choice-noise', 'other-model'];

/**
 * Default parameters of the stress truths (planning assumptions a user can change): s from
 * U(0.4, 0.9) and β = 0.8 are recalled from memory as ordinary values in the literature, not
 * estimates; halving γ is common practice for a noisier sample.
 */
export const STRESS_DEFAULTS = {
  'delay-sensitivity': { kind: 'delay-sensitivity', low: 0.4, high: 0.9 },
  'no-magnitude-effect': { kind: 'no-magnitude-effect' },
  'present-bias': { kind: 'present-bias', beta: 0.8 },
  'choice-noise': { kind: 'choice-noise', factor: 0.5 },
  'other-model': { kind: 'other-model' },
} as const satisfies Record<StressKind, StressTruth>;

const EXPONENTIAL_FAMILY: readonly ModelId[] = ['exponential', 'exponential-power', 'quasi-hyperbolic'];

/**
 * The model with a delay sensitivity s in a model's family: exponential with delay sensitivity
 * for the exponential family, hyperboloid for the hyperboloid, else the power-delay hyperbola.
 *
 * @example sensitivityModel({ id: 'hyperbolic' }) // 'power-delay'
 */
export function sensitivityModel(model: ModelSpec): 'exponential-power' | 'hyperboloid' | 'power-delay' {
  if (EXPONENTIAL_FAMILY.includes(model.id)) return 'exponential-power';
  return model.id === 'hyperboloid' ? 'hyperboloid' : 'power-delay';
}

function checkStress(stress: StressTruth, field: string): void {
  switch (stress?.kind) {
    case 'delay-sensitivity':
      if (!(stress.low > 0 && stress.low <= 1)) throw new DesignInputError(`${field}.low`, 'a delay sensitivity above 0 and at most 1', stress.low);
      if (!(stress.high >= stress.low && stress.high <= 1)) throw new DesignInputError(`${field}.high`, `a delay sensitivity from low (${stress.low}) to 1`, stress.high);
      return;
    case 'present-bias':
      if (!(stress.beta > 0 && stress.beta < 1)) throw new DesignInputError(`${field}.beta`, 'a present bias β strictly between 0 and 1', stress.beta);
      return;
    case 'choice-noise':
      if (!(stress.factor > 0 && stress.factor < 1)) throw new DesignInputError(`${field}.factor`, 'a factor strictly between 0 and 1', stress.factor);
      return;
    case 'no-magnitude-effect':
    case 'other-model':
      return;
    default:
      throw new DesignInputError(`${field}.kind`, STRESS_KINDS.map((k) => `'${k}'`).join(', '), (stress as { kind?: unknown })?.kind);
  }
}

/**
 * The truth under a stress: the assumed truth with the one named deviation applied.
 *
 * @throws DesignInputError naming the stress's field that is out of range
 * @example applyStress({ model: { id: 'hyperbolic' }, prior, gamma: 10, lapse: 0 }, { kind: 'choice-noise', factor: 0.5 }).gamma // 5
 */
export function applyStress(truth: PowerTruth, stress: StressTruth, field = 'stress'): PowerTruth {
  checkStress(stress, field);
  switch (stress.kind) {
    case 'delay-sensitivity':
      return { ...truth, model: { id: sensitivityModel(truth.model), sensitivity: (stress.low + stress.high) / 2 }, sensitivityRange: { low: stress.low, high: stress.high } };
    case 'no-magnitude-effect':
      return { ...truth, magnitudeEffect: false };
    case 'present-bias':
      return { ...truth, presentBias: stress.beta };
    case 'choice-noise':
      return { ...truth, gamma: truth.gamma * stress.factor };
    case 'other-model':
      return { ...truth, model: EXPONENTIAL_FAMILY.includes(truth.model.id) ? { id: 'hyperbolic' } : { id: 'exponential' } };
  }
}

/**
 * The scenarios of a run with stress truths: the assumed one first, then one per stress, each
 * the same design, test, sample sizes, replications and seed with the stressed truth.
 *
 * @throws DesignInputError for a stress out of range or a kind listed twice
 */
export function stressScenarios(scenario: PowerScenario, stress: readonly StressTruth[]): PowerScenario[] {
  const seen = new Set<string>();
  return [
    scenario,
    ...stress.map((s, i) => {
      if (seen.has(s?.kind)) throw new DesignInputError(`stress[${i}].kind`, 'each kind of stress truth once', s?.kind);
      seen.add(s?.kind);
      return { ...scenario, truth: applyStress(scenario.truth, s, `stress[${i}]`) };
    }),
  ];
}

/** A stress truth in words, for legends, tables and the method paragraph. */
export function describeStress(stress: StressTruth): string {
  switch (stress.kind) {
    case 'delay-sensitivity':
      return `delay sensitivity s drawn per participant from U(${stress.low}, ${stress.high})`;
    case 'no-magnitude-effect':
      return 'no magnitude effect (large-reward rate equal to the small-reward rate)';
    case 'present-bias':
      return `present bias β = ${stress.beta} on every delayed value`;
    case 'choice-noise':
      return `noisier choices (γ × ${stress.factor})`;
    case 'other-model':
      return 'the other model (exponential for a hyperbolic-family truth, hyperbolic for an exponential-family one)';
  }
}

/** A stress truth in a few words, for a figure legend. */
export function stressLegend(stress: StressTruth): string {
  switch (stress.kind) {
    case 'delay-sensitivity':
      return `s ~ U(${stress.low}, ${stress.high})`;
    case 'no-magnitude-effect':
      return 'no magnitude effect';
    case 'present-bias':
      return `present bias β = ${stress.beta}`;
    case 'choice-noise':
      return `noisier choices (γ × ${stress.factor})`;
    case 'other-model':
      return 'the other model';
  }
}
