import { DesignInputError } from './DesignInputError';
import type { RatePrior } from './ratePrior';

/**
 * Maximum-likelihood bivariate normal prior on (ln kSmall, ln kLarge) from pilot estimates:
 * means of the logs (reported as medians), standard deviations with divisor n (the ML
 * estimator, not n − 1), and the Pearson correlation of the logs. When either SD is 0 the
 * correlation is undefined and reported as 0.
 *
 * @param estimates at least 3 rows of positive finite rates per day
 * @throws DesignInputError for fewer than 3 rows or a rate that is not a positive finite number
 * @example fitPrior([{ kSmall: 0.01, kLarge: 0.001 }, { kSmall: 0.01, kLarge: 0.001 }, { kSmall: 0.01, kLarge: 0.001 }]).medianSmall // 0.01
 */
export function fitPrior(estimates: readonly { kSmall: number; kLarge: number }[]): RatePrior {
  if (!Array.isArray(estimates) || estimates.length < 3) {
    throw new DesignInputError('estimates', 'a list of at least 3 rows {kSmall, kLarge}', Array.isArray(estimates) ? estimates.length : estimates);
  }
  const n = estimates.length;
  const a = new Float64Array(n);
  const b = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const { kSmall, kLarge } = estimates[i] ?? ({} as { kSmall: number; kLarge: number });
    if (!(kSmall > 0 && kSmall < Infinity)) throw new DesignInputError(`estimates[${i}].kSmall`, 'a finite rate greater than 0 (per day)', kSmall);
    if (!(kLarge > 0 && kLarge < Infinity)) throw new DesignInputError(`estimates[${i}].kLarge`, 'a finite rate greater than 0 (per day)', kLarge);
    a[i] = Math.log(kSmall);
    b[i] = Math.log(kLarge);
  }
  let ma = 0;
  let mb = 0;
  for (let i = 0; i < n; i++) {
    ma += a[i];
    mb += b[i];
  }
  ma /= n;
  mb /= n;
  let saa = 0;
  let sbb = 0;
  let sab = 0;
  for (let i = 0; i < n; i++) {
    const da = a[i] - ma;
    const db = b[i] - mb;
    saa += da * da;
    sbb += db * db;
    sab += da * db;
  }
  const sdA = Math.sqrt(saa / n);
  const sdB = Math.sqrt(sbb / n);
  const correlation = saa > 0 && sbb > 0 ? Math.max(-1, Math.min(1, sab / Math.sqrt(saa * sbb))) : 0;
  return { medianSmall: Math.exp(ma), medianLarge: Math.exp(mb), sdLogSmall: sdA, sdLogLarge: sdB, correlation };
}
