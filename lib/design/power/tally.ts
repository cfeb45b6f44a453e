import { PAIR_ROLES, type PairRole, type PowerTally } from './types';

/** An all-zero tally for the given sample sizes. */
export function emptyTally(sampleSizes: readonly number[]): PowerTally {
  const m = sampleSizes.length;
  const zeros = () => new Array<number>(m).fill(0);
  const patterns = {} as Record<PairRole, number[][]>;
  for (const role of PAIR_ROLES) patterns[role] = Array.from({ length: m }, () => [0, 0, 0, 0]);
  return {
    sampleSizes: [...sampleSizes],
    replicates: 0,
    rejections: zeros(),
    probeReversals: zeros(),
    patterns,
    flagged: zeros(),
    fallback: zeros(),
    probesInTrueZone: zeros(),
    longestProbeDelay: 0,
  };
}

/**
 * Sum of tallies over the same sample sizes. Every field is a whole-number count (or a
 * maximum), so the sum is exact and does not depend on the order of the parts.
 *
 * @throws Error when the parts were made for different sample sizes
 */
export function mergeTallies(parts: readonly PowerTally[]): PowerTally {
  if (parts.length === 0) throw new Error('mergeTallies: nothing to merge');
  const total = emptyTally(parts[0].sampleSizes);
  for (const part of parts) {
    if (part.sampleSizes.join(',') !== total.sampleSizes.join(',')) throw new Error('mergeTallies: tallies for different sample sizes');
    total.replicates += part.replicates;
    for (let j = 0; j < total.sampleSizes.length; j++) {
      total.rejections[j] += part.rejections[j];
      total.probeReversals[j] += part.probeReversals[j];
      total.flagged[j] += part.flagged[j];
      total.fallback[j] += part.fallback[j];
      total.probesInTrueZone[j] += part.probesInTrueZone[j];
      for (const role of PAIR_ROLES) for (let p = 0; p < 4; p++) total.patterns[role][j][p] += part.patterns[role][j][p];
    }
    total.longestProbeDelay = Math.max(total.longestProbeDelay, part.longestProbeDelay);
  }
  return total;
}
