// Shared fixtures for the analysis tests: a design like the power benchmark's, and a log-likelihood
// written straight from docs/mathematics.md with the public discountFactor and choiceProbability, so the
// refit's own likelihood code is checked against an independent path.
import { choiceProbability, discountFactor, type FitChoice, type ModelId, type ModelParameters, type ModelSpec, type PowerDesign, type PowerTruth } from '@/lib/design';

export const prior = { medianSmall: 0.02, medianLarge: 0.008, sdLogSmall: 0.5, sdLogLarge: 0.5, correlation: 0.8 };

export function design(overrides: Partial<PowerDesign['spec']> = {}): PowerDesign {
  return {
    spec: {
      model: { id: 'hyperbolic' },
      ratio: 0.6,
      largeAmount: 100,
      currency: 'EUR',
      mode: 'personalised',
      soonDelay: { mode: 'fixed', days: 30 },
      lateDelayLimit: 3650,
      probePairs: 4,
      lateAnchors: 2,
      soonAnchors: 2,
      calibration: { itemsPerMagnitude: 20, minDelay: 1, maxDelay: 365 },
      ...overrides,
    },
    prior,
    soonDelay: 30,
  };
}

export function truth(model: ModelSpec, gamma: number, lapse = 0): PowerTruth {
  return { model, prior, gamma, lapse };
}

export function spec(id: ModelId, p: ModelParameters): ModelSpec {
  return { id, sensitivity: p.sensitivity, presentBias: p.presentBias };
}

/** ln L from the definitions: P(later) = choiceProbability(γ, ε; L·f(D) − S·f(d), in units of L). */
export function referenceLogLikelihood(model: ModelSpec, p: { kSmall: number; kLarge: number }, choices: readonly FitChoice[], gamma: number, lapse = 0): number {
  let sum = 0;
  for (const c of choices) {
    const rate = (m: 'small' | 'large') => (m === 'small' ? p.kSmall : p.kLarge);
    const gap = discountFactor(model, rate(c.laterMagnitude), c.laterDelay) - (c.soonerAmount / c.laterAmount) * discountFactor(model, rate(c.soonerMagnitude), c.soonerDelay);
    const later = choiceProbability({ sensitivity: gamma, lapse }, gap);
    sum += Math.log(c.later ? later : 1 - later);
  }
  return sum;
}

/**
 * The rate under `model` whose discount factor at 100 days equals the hyperbolic one at `hyperbolicRate`
 * (inverting each discount function at D = 100), so truths of different models are equally patient
 * around the middle of the calibration delays and the calibration block stays informative.
 */
export function matchedRate(model: ModelSpec, hyperbolicRate: number): number {
  const v = 1 / (1 + 100 * hyperbolicRate);
  const s = model.sensitivity ?? 1;
  switch (model.id) {
    case 'hyperbolic':
      return hyperbolicRate;
    case 'exponential':
      return -Math.log(v) / 100;
    case 'hyperboloid':
      return (Math.pow(v, -1 / s) - 1) / 100;
    case 'power-delay':
      return (1 / v - 1) / Math.pow(100, s);
    case 'exponential-power':
      return -Math.log(v) / Math.pow(100, s);
    case 'quasi-hyperbolic':
      return -Math.log(v / (model.presentBias ?? 1)) / 100;
  }
}

/** A truth of `model` whose prior medians are matched to the shared prior's (matchedRate). */
export function matchedTruth(model: ModelSpec, gamma: number, lapse = 0): PowerTruth {
  return { model, prior: { ...prior, medianSmall: matchedRate(model, prior.medianSmall), medianLarge: matchedRate(model, prior.medianLarge) }, gamma, lapse };
}
