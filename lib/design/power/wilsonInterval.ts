import { DesignInputError } from '../DesignInputError';
import { normalQuantile } from './normalQuantile';

/**
 * Wilson score interval for a binomial proportion (Wilson 1927, J Am Stat Assoc 22:209–212;
 * method 3 in Newcombe 1998, Stat Med 17:857–872):
 *   centre = (p̂ + z²/2n) / (1 + z²/n),  half-width = z/(1 + z²/n) · √(p̂(1 − p̂)/n + z²/4n²),
 * with z = Φ⁻¹(1 − (1 − confidence)/2). No trials gives the whole interval [0, 1].
 *
 * @throws DesignInputError for counts that are not whole numbers, successes > trials, or a
 *   confidence outside (0, 1)
 * @example wilsonInterval(81, 263) // { lower: 0.2553…, upper: 0.3662… } (Newcombe 1998, Table I)
 */
export function wilsonInterval(successes: number, trials: number, confidence = 0.95): { lower: number; upper: number } {
  if (!(Number.isSafeInteger(trials) && trials >= 0)) throw new DesignInputError('trials', 'a whole number, 0 or more', trials);
  if (!(Number.isSafeInteger(successes) && successes >= 0 && successes <= trials)) {
    throw new DesignInputError('successes', `a whole number from 0 to trials (${trials})`, successes);
  }
  if (!(confidence > 0 && confidence < 1)) throw new DesignInputError('confidence', 'a number strictly between 0 and 1', confidence);
  if (trials === 0) return { lower: 0, upper: 1 };
  // z from the lower tail: 1 − α/2 would be rounded to the spacing of doubles near 1 before the quantile sees it
  const z = -normalQuantile((1 - confidence) / 2);
  const n = trials;
  const p = successes / n;
  const z2 = z * z;
  const denominator = 1 + z2 / n;
  const centre = (p + z2 / (2 * n)) / denominator;
  const half = (z / denominator) * Math.sqrt((p * (1 - p)) / n + z2 / (4 * n * n));
  // the ends are exactly 0 and 1 at 0 and n successes; rounding must not push them past
  return {
    lower: successes === 0 ? 0 : Math.max(0, centre - half),
    upper: successes === n ? 1 : Math.min(1, centre + half),
  };
}
