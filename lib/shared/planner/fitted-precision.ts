/**
 * Fitted values shown at a readable precision while the exact value is kept: a prior fitted
 * from a pilot file fills its fields with four significant digits, and saving restores the exact
 * fitted value for every field the user left as shown (a field they typed into keeps what they typed).
 */
export const SHOWN_DIGITS = 4;

/** A number at four significant digits, as a number a form field can hold ("0.02135" rather than "0.021346780122334455"). */
export function shownValue(exact: number, digits = SHOWN_DIGITS): number {
  return Number.isFinite(exact) ? Number(exact.toPrecision(digits)) : exact;
}

export type FittedValues<K extends string> = Partial<Record<K, { shown: number; exact: number }>>;

/** Remembers each exact fitted value beside what the field shows. */
export function rememberFit<K extends string>(exact: Record<K, number>, digits = SHOWN_DIGITS): FittedValues<K> {
  const out: FittedValues<K> = {};
  for (const key of Object.keys(exact) as K[]) out[key] = { shown: shownValue(exact[key], digits), exact: exact[key] };
  return out;
}

/** The values to save: the exact fitted value wherever the field still holds the shown one. */
export function restoreExact<V extends Record<string, unknown>>(values: V, fitted: FittedValues<Extract<keyof V, string>>): V {
  const out: Record<string, unknown> = { ...values };
  for (const [key, fit] of Object.entries(fitted) as Array<[string, { shown: number; exact: number } | undefined]>) {
    if (fit && out[key] === fit.shown) out[key] = fit.exact;
  }
  return out as V;
}
