import { DesignInputError } from '../DesignInputError';

/**
 * Digits after the decimal point of a currency's minor unit (ISO 4217, as Intl reports it):
 * 2 for EUR and USD, 0 for JPY, 3 for BHD.
 *
 * @throws DesignInputError when `currency` is not a three-letter ISO 4217 code Intl knows
 * @example currencyDigits('EUR') === 2
 */
export function currencyDigits(currency: string): number {
  if (typeof currency !== 'string' || !/^[A-Z]{3}$/.test(currency)) throw new DesignInputError('currency', 'a three-letter ISO 4217 code in capitals', currency);
  try {
    return new Intl.NumberFormat('en', { style: 'currency', currency }).resolvedOptions().maximumFractionDigits ?? 2;
  } catch {
    throw new DesignInputError('currency', 'a currency code Intl knows', currency);
  }
}

/**
 * An amount in major units (as the item bank writes it: 37.5 euro) as a whole number of minor
 * units (3750 cent), so money is never added or compared in floating point. The amount must be
 * a whole number of minor units to within 1e-9 of a minor unit (binary noise from the item
 * bank's rounding, e.g. 0.1 + 0.2); anything finer is refused rather than silently rounded.
 *
 * @throws DesignInputError when the amount is negative, not finite, not whole in minor units, or beyond 2^53 minor units
 * @example toMinorUnits({ amount: 37.5, currency: 'EUR' }) === 3750
 */
export function toMinorUnits(options: { amount: number; currency: string }): number {
  const { amount, currency } = options;
  const digits = currencyDigits(currency);
  if (typeof amount !== 'number' || !Number.isFinite(amount) || amount < 0) throw new DesignInputError('amount', 'a finite amount of 0 or more', amount);
  const scaled = amount * 10 ** digits;
  const minor = Math.round(scaled);
  if (!Number.isSafeInteger(minor)) throw new DesignInputError('amount', `at most ${Number.MAX_SAFE_INTEGER} minor units`, amount);
  if (Math.abs(scaled - minor) > 1e-9 * Math.max(1, minor)) throw new DesignInputError('amount', `a whole number of ${currency} minor units (${digits} decimals)`, amount);
  return minor;
}

/**
 * Minor units as the decimal text of the major amount, exactly (string arithmetic, no division):
 * 3750 EUR → "37.50", 500 JPY → "500".
 *
 * @example formatMinorUnits({ minor: 3750, currency: 'EUR' }) === '37.50'
 */
export function formatMinorUnits(options: { minor: number; currency: string }): string {
  const { minor, currency } = options;
  if (!Number.isSafeInteger(minor) || minor < 0) throw new DesignInputError('minor', 'a whole number of minor units, 0 or more', minor);
  const digits = currencyDigits(currency);
  if (digits === 0) return String(minor);
  const text = String(minor).padStart(digits + 1, '0');
  return `${text.slice(0, -digits)}.${text.slice(-digits)}`;
}
