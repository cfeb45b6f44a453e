import { DesignInputError } from './DesignInputError';
import type { ModelSpec } from './types';

// Checks are written as `!(lo < v && v < hi)` so that NaN fails every one of them.
// The throwing halves live in separate functions to keep the hot paths short.

/** Throws the ratio error. */
export function failRatio(value: unknown): never {
  throw new DesignInputError('ratio', 'a number strictly between 0 and 1', value);
}
/** Throws a rate error for `field`. */
export function failRate(field: string, value: unknown): never {
  throw new DesignInputError(field, 'a finite number greater than 0 (per day)', value);
}
/** Throws a delay error for `field`. */
export function failDelay(field: string, value: unknown): never {
  throw new DesignInputError(field, 'a finite number of days, 0 or more', value);
}

/** Ratio x = S/L must lie strictly between 0 and 1. */
export function checkRatio(x: number): void {
  if (!(x > 0 && x < 1)) failRatio(x);
}
/** A rate (per day) must be finite and > 0. */
export function checkRate(field: string, k: number): void {
  if (!(k > 0 && k < Infinity)) failRate(field, k);
}
/** A delay (days) must be finite and ≥ 0. */
export function checkDelay(field: string, d: number): void {
  if (!(d >= 0 && d < Infinity)) failDelay(field, d);
}
/** A finite number > 0. */
export function checkPositive(field: string, v: number): void {
  if (!(v > 0 && v < Infinity)) throw new DesignInputError(field, 'a finite number greater than 0', v);
}
/** A number in [0, 1]. */
export function checkProbability(field: string, v: number, allowed = 'a number from 0 to 1'): void {
  if (!(v >= 0 && v <= 1)) throw new DesignInputError(field, allowed, v);
}
/** A whole number in [min, max]. */
export function checkInteger(field: string, v: number, min: number, max: number): void {
  if (!(Number.isInteger(v) && v >= min && v <= max)) {
    throw new DesignInputError(field, `a whole number from ${min} to ${max}`, v);
  }
}

/**
 * The smallest delay sensitivity s the core computes with. Below it t^s differs from 1 by less
 * than 1e-5 over every delay up to 25 years (ln 9131 ≈ 9.1), so the delay term carries no
 * information, and the late-delay optimiser's slope loses its root in rounding (it failed to
 * converge at s = 1e-100 and below in the schema sweep, tests/unit/security/schema-extremes).
 */
export const MIN_SENSITIVITY = 1e-6;

/** Validates a model: known id, s finite and at least MIN_SENSITIVITY when given, 0 < β ≤ 1 when given. */
export function checkModel(model: ModelSpec): void {
  if (model === null || typeof model !== 'object') {
    throw new DesignInputError('model', 'an object with a model id', model);
  }
  const s = model.sensitivity;
  if (s !== undefined && !(s >= MIN_SENSITIVITY && s < Infinity)) {
    throw new DesignInputError('model.sensitivity', `a finite number of at least ${MIN_SENSITIVITY}`, s);
  }
  const b = model.presentBias;
  if (b !== undefined && !(b > 0 && b <= 1)) {
    throw new DesignInputError('model.presentBias', 'a number greater than 0 and at most 1', b);
  }
  switch (model.id) {
    case 'exponential':
    case 'hyperbolic':
    case 'hyperboloid':
    case 'power-delay':
    case 'exponential-power':
    case 'quasi-hyperbolic':
      return;
    default:
      throw new DesignInputError(
        'model.id',
        'one of exponential, hyperbolic, hyperboloid, power-delay, exponential-power, quasi-hyperbolic',
        model.id,
      );
  }
}

/** Validates the fields every pair-level function shares. */
export function checkPairInput(
  model: ModelSpec,
  ratio: number,
  soonDelay: number,
  kSmall: number,
  kLarge: number,
): void {
  checkModel(model);
  if (!(ratio > 0 && ratio < 1)) failRatio(ratio);
  if (!(soonDelay >= 0 && soonDelay < Infinity)) failDelay('soonDelay', soonDelay);
  if (!(kSmall > 0 && kSmall < Infinity)) failRate('kSmall', kSmall);
  if (!(kLarge > 0 && kLarge < Infinity)) failRate('kLarge', kLarge);
}

/** A late delay must exceed the soon delay; Infinity is allowed (both discount factors vanish). */
export function checkLateDelay(lateDelay: number, soonDelay: number): void {
  if (!(lateDelay > soonDelay)) {
    throw new DesignInputError('lateDelay', `a number of days greater than soonDelay (${soonDelay})`, lateDelay);
  }
}
