import { DesignInputError } from './DesignInputError';

export type ExtrapolationWarning = {
  kind: 'extrapolation';
  longestCalibrationDelay: number;
  longestProbeDelay: number;
  factor: number;
  message: string;
};

/**
 * Flags probe delays that reach beyond `factor` times the longest calibration delay. Rates
 * estimated on short delays place the reversal zone wrongly at long delays when the true
 * delay sensitivity differs from the assumed one (docs/mathematics.md, "Power").
 *
 * @param options.calibrationDelays later delays of the calibration items, days
 * @param options.probeDelays late delays of the probe pairs, days
 * @param options.factor default 3; must be at least 1
 * @returns null when every probe delay is within the factor, else a structured warning
 * @throws DesignInputError for empty or invalid delay lists or a bad factor
 * @example extrapolationWarning({ calibrationDelays: [7, 30], probeDelays: [60] }) // null
 */
export function extrapolationWarning(options: {
  calibrationDelays: readonly number[];
  probeDelays: readonly number[];
  factor?: number;
}): ExtrapolationWarning | null {
  const factor = options.factor ?? 3;
  if (!(factor >= 1 && factor < Infinity)) throw new DesignInputError('factor', 'a finite number, 1 or more', factor);
  const longestCalibrationDelay = longest('calibrationDelays', options.calibrationDelays);
  const longestProbeDelay = longest('probeDelays', options.probeDelays);
  if (longestProbeDelay <= factor * longestCalibrationDelay) return null;
  const ratio = longestProbeDelay / longestCalibrationDelay;
  return {
    kind: 'extrapolation',
    longestCalibrationDelay,
    longestProbeDelay,
    factor,
    message:
      `Probe delays reach ${round(longestProbeDelay)} days, ${round(ratio)} times the longest calibration delay ` +
      `(${round(longestCalibrationDelay)} days; the limit is ${factor} times). If participants' true delay sensitivity ` +
      `differs from the model's, rates estimated on short delays can misplace the reversal zone at long ones.`,
  };
}

function longest(field: string, delays: readonly number[]): number {
  if (!Array.isArray(delays) || delays.length === 0) throw new DesignInputError(field, 'a non-empty list of delays in days', delays);
  let max = 0;
  delays.forEach((v, i) => {
    if (!(v > 0 && v < Infinity)) throw new DesignInputError(`${field}[${i}]`, 'a finite number of days greater than 0', v);
    if (v > max) max = v;
  });
  return max;
}

function round(v: number): string {
  return v >= 10 ? String(Math.round(v)) : String(Math.round(v * 10) / 10);
}
