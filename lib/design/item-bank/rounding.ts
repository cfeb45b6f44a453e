import type { DelayUnit } from './types';

const UNIT_DAYS: Record<DelayUnit, number> = { days: 1, weeks: 7, months: 30 };

/** Days per delay unit: a day, a week, or a 30-day month. */
export function unitDays(unit: DelayUnit): number {
  return UNIT_DAYS[unit];
}

/**
 * The currency's smallest coin (its minor unit, from Intl: 0.01 for EUR, 1 for JPY).
 * Unknown codes fall back to 0.01.
 */
export function minorUnit(currency: string): number {
  try {
    const digits = new Intl.NumberFormat('en', { style: 'currency', currency }).resolvedOptions().maximumFractionDigits ?? 2;
    return Math.pow(10, -digits);
  } catch {
    return 0.01;
  }
}

/**
 * The step amounts are rounded to: the largest 1–2–5 step (times a power of ten, never below the
 * minor unit) that is at most 1/200 of the large amount and 1/20 of the small one, so rounding
 * moves an amount by at most 0.25 % of the large reward (common practice: round, readable sums
 * that barely move the indifference rates; the rounding report checks the effect).
 *
 * @example amountUnit({ currency: 'EUR', largeAmount: 100, smallAmount: 40 }) // 0.5
 */
export function amountUnit(options: { currency: string; largeAmount: number; smallAmount: number }): number {
  const minor = minorUnit(options.currency);
  const cap = Math.min(options.largeAmount / 200, options.smallAmount / 20);
  let best = minor;
  for (let exp = Math.round(Math.log10(minor)); exp <= 9; exp++) {
    for (const m of [1, 2, 5]) {
      const step = m * Math.pow(10, exp);
      if (step >= minor - 1e-12 && step <= cap + 1e-12) best = Math.max(best, step);
    }
  }
  return clean(best);
}

/** `value` rounded to a multiple of `unit`, without binary noise (37.5, not 37.500000000000004). */
export function roundTo(value: number, unit: number): number {
  return clean(Math.round(value / unit) * unit);
}

/** A delay in days rounded to whole units (at least one unit when the delay is positive). */
export function roundDelay(days: number, unit: DelayUnit): number {
  if (days === 0) return 0;
  const u = UNIT_DAYS[unit];
  return Math.max(u, Math.round(days / u) * u);
}

function clean(v: number): number {
  return Number(v.toFixed(10));
}
