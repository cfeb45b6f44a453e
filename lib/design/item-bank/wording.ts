import type { DelayUnit, Side } from './types';
import { unitDays } from './rounding';

/**
 * A delay as participants read it: "today", "in 1 day", "in 3 weeks", "in 2 months". A delay
 * is shown in the chosen unit only when it is a whole number of that unit (a month is 30 days,
 * said once in the export header); otherwise in days.
 *
 * @example delayText(21, 'weeks') // 'in 3 weeks'
 */
export function delayText(days: number, unit: DelayUnit = 'days'): string {
  if (days === 0) return 'today';
  const u = unitDays(unit);
  if (u > 1 && days % u === 0) {
    const n = days / u;
    const name = unit === 'weeks' ? 'week' : 'month';
    return `in ${n} ${name}${n === 1 ? '' : 's'}`;
  }
  return `in ${days} day${days === 1 ? '' : 's'}`;
}

/**
 * An amount in the study's currency, with the currency's own symbol or code (English number
 * format), without trailing zero cents for whole amounts.
 *
 * @example amountText(37.5, 'EUR') // '€37.50'
 */
export function amountText(amount: number, currency: string): string {
  const whole = Number.isInteger(amount);
  const format = formatter(currency, whole);
  return format ? format.format(amount) : `${amount} ${currency}`;
}

// Building an Intl.NumberFormat costs far more than using one; the API words items per request.
const formatters = new Map<string, Intl.NumberFormat | null>();

function formatter(currency: string, whole: boolean): Intl.NumberFormat | null {
  const key = `${currency}:${whole}`;
  let f = formatters.get(key);
  if (f === undefined) {
    try {
      f = new Intl.NumberFormat('en', { style: 'currency', currency, ...(whole ? { minimumFractionDigits: 0, maximumFractionDigits: 0 } : {}) });
    } catch {
      f = null;
    }
    formatters.set(key, f);
  }
  return f;
}

/**
 * The question text of one item, in Switchback's wording: the two options in the order they
 * are shown (left first), e.g. "Which would you take: €37.50 today, or €100 in 6 weeks?"
 */
export function itemText(options: {
  soonerAmount: number;
  soonerDelay: number;
  laterAmount: number;
  laterDelay: number;
  soonerSide: Side;
  currency: string;
  delayUnit?: DelayUnit;
}): string {
  const unit = options.delayUnit ?? 'days';
  const sooner = `${amountText(options.soonerAmount, options.currency)} ${delayText(options.soonerDelay, unit)}`;
  const later = `${amountText(options.laterAmount, options.currency)} ${delayText(options.laterDelay, unit)}`;
  const [left, right] = options.soonerSide === 'left' ? [sooner, later] : [later, sooner];
  return `Which would you take: ${left}, or ${right}?`;
}
