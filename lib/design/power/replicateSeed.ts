import { DesignInputError } from '../DesignInputError';

/**
 * Seed of replicate r of a run: the run seed and r mixed by the 32-bit finaliser of
 * MurmurHash3 (Appleby 2011, public domain; also the mixer of SplitMix), so that every
 * replicate has its own stream whatever worker thread simulates it, and neighbouring
 * replicates get unrelated streams.
 *
 * @throws DesignInputError for a seed or index that is not a safe whole number ≥ 0
 * @example replicateSeed(1, 0) === replicateSeed(1, 0) // true
 */
export function replicateSeed(runSeed: number, replicate: number): number {
  if (!Number.isSafeInteger(runSeed)) throw new DesignInputError('seed', 'a whole number', runSeed);
  if (!(Number.isSafeInteger(replicate) && replicate >= 0)) throw new DesignInputError('replicate', 'a whole number, 0 or more', replicate);
  let h = mix(runSeed | 0) ^ mix((Math.floor(runSeed / 4294967296) | 0) + 0x632be5ab);
  h = mix((h + Math.imul(replicate | 0, 0x9e3779b9)) | 0);
  h = mix(h ^ (Math.floor(replicate / 4294967296) | 0));
  return h >>> 0;
}

function mix(x: number): number {
  let h = x | 0;
  h ^= h >>> 16;
  h = Math.imul(h, 0x85ebca6b);
  h ^= h >>> 13;
  h = Math.imul(h, 0xc2b2ae35);
  h ^= h >>> 16;
  return h;
}
