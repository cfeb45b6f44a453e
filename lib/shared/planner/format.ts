/** Days as a whole number above 10, one decimal below ("—" when missing). */
export function fmtDays(v: number | null | undefined): string {
  if (v === null || v === undefined || !Number.isFinite(v)) return v === Infinity ? '∞' : '—';
  return v >= 10 ? Math.round(v).toLocaleString('en-GB') : (Math.round(v * 10) / 10).toString();
}

/** A rate per day with three significant digits. */
export function fmtRate(v: number | null | undefined): string {
  if (v === null || v === undefined || !Number.isFinite(v)) return '—';
  return Number(v.toPrecision(3)).toString();
}

/** A share as a percentage with one decimal. */
export function fmtShare(v: number | null | undefined): string {
  if (v === null || v === undefined || !Number.isFinite(v)) return '—';
  return `${(100 * v).toFixed(1)}%`;
}

/** A small number (gap product, clarity) with three significant digits. */
export function fmtSmall(v: number | null | undefined): string {
  if (v === null || v === undefined || !Number.isFinite(v)) return '—';
  return Math.abs(v) >= 0.01 || v === 0 ? Number(v.toPrecision(3)).toString() : v.toExponential(2);
}

/**
 * One format for a whole row of small numbers: exponent notation for every value when any
 * non-zero value is below 0.01, so a row never mixes "0.0123" with "4.56e-3".
 */
export function fmtSmallRow(values: ReadonlyArray<number | null | undefined>): (v: number | null | undefined) => string {
  const tiny = values.some((v) => v !== null && v !== undefined && Number.isFinite(v) && v !== 0 && Math.abs(v) < 0.01);
  return (v) => {
    if (v === null || v === undefined || !Number.isFinite(v)) return '—';
    return tiny ? v.toExponential(2) : Number(v.toPrecision(3)).toString();
  };
}
