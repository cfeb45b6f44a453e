import { DesignInputError } from '../DesignInputError';

/** Slots per magnitude: room for about 180,000 response vectors of each magnitude at the fill limit. */
const SLOTS = 1 << 18;
const MASK = SLOTS - 1;
const FILL_LIMIT = Math.floor(SLOTS * 0.7);
const MAX_PROBES = 64;
// bytes: rates (8 per slot, both magnitudes), then keys and states (4 each), then the fill counter
const RATES_BYTES = 2 * SLOTS * 8;
const KEYS_BYTES = 2 * SLOTS * 4;
const BUFFER_BYTES = RATES_BYTES + 2 * KEYS_BYTES + 8;

/** The most items per magnitude whose response vectors the table holds: a leading 1 and 30 answers fit a 32-bit key. */
export const SHARED_MAX_ITEMS = 30;

/** A buffer for SharedEstimates, about 8 MB; give the same buffer to every thread of a run. */
export function sharedEstimateBuffer(): SharedArrayBuffer {
  return new SharedArrayBuffer(BUFFER_BYTES);
}

/**
 * Calibration estimates by response vector, in memory shared by the worker threads of one run, so
 * a vector is estimated once between them rather than once per thread (an estimate depends only on
 * the vector and the design, so which thread computes it does not change it, and tallies stay the
 * same). Open addressing with linear probing, one table per magnitude. A thread claims a slot with
 * an atomic compare-and-exchange of its key, writes the rate, then publishes the slot with an
 * atomic store of its state; a reader that loads a published state sees the rate written before it
 * (the memory model's synchronisation of atomics). A slot claimed but not yet published reads as
 * absent, so that reader computes the estimate itself. When a table is 70 % full or a probe runs
 * long, nothing more is stored and callers compute as before.
 */
export class SharedEstimates {
  private readonly rates: Float64Array;
  private readonly keys: Int32Array;
  private readonly states: Int32Array;
  private readonly filled: Int32Array;

  /** @throws DesignInputError when `buffer` is not one made by sharedEstimateBuffer */
  constructor(buffer: SharedArrayBuffer) {
    if (!(buffer instanceof SharedArrayBuffer) || buffer.byteLength !== BUFFER_BYTES) throw new DesignInputError('sharedEstimates', 'a buffer made by sharedEstimateBuffer()', buffer);
    this.rates = new Float64Array(buffer, 0, 2 * SLOTS);
    this.keys = new Int32Array(buffer, RATES_BYTES, 2 * SLOTS);
    this.states = new Int32Array(buffer, RATES_BYTES + KEYS_BYTES, 2 * SLOTS);
    this.filled = new Int32Array(buffer, RATES_BYTES + 2 * KEYS_BYTES, 2);
  }

  /**
   * The stored estimate of response vector `key` (a leading 1, then up to SHARED_MAX_ITEMS answer
   * bits) of a magnitude (0 small, 1 large): its slot, or −1 when none is published. Read it with
   * rateAt and flagsAt.
   */
  find(magnitude: 0 | 1, key: number): number {
    const base = magnitude * SLOTS;
    let slot = hash(key);
    for (let probe = 0; probe < MAX_PROBES; probe++) {
      const at = base + slot;
      const held = Atomics.load(this.keys, at);
      if (held === 0) return -1;
      if (held === key) return Atomics.load(this.states, at) === 0 ? -1 : at;
      slot = (slot + 1) & MASK;
    }
    return -1;
  }

  /** The rate in a slot find returned. */
  rateAt(at: number): number {
    return this.rates[at];
  }

  /** Whether the estimate in a slot find returned is flagged, and whether it sends the participant to the fallback set. */
  flagsAt(at: number): { flagged: boolean; fallback: boolean } {
    const state = this.states[at];
    return { flagged: (state & 2) !== 0, fallback: (state & 4) !== 0 };
  }

  /** How many estimates of a magnitude are stored. */
  stored(magnitude: 0 | 1): number {
    return Atomics.load(this.filled, magnitude);
  }

  /** Stores an estimate (first writer wins; a full table or a long probe stores nothing). */
  store(magnitude: 0 | 1, key: number, rate: number, flagged: boolean, fallback: boolean): void {
    if (Atomics.load(this.filled, magnitude) >= FILL_LIMIT) return;
    const base = magnitude * SLOTS;
    let slot = hash(key);
    for (let probe = 0; probe < MAX_PROBES; probe++) {
      const at = base + slot;
      const held = Atomics.compareExchange(this.keys, at, 0, key);
      if (held === 0) {
        this.rates[at] = rate;
        Atomics.store(this.states, at, 1 | (flagged ? 2 : 0) | (fallback ? 4 : 0));
        Atomics.add(this.filled, magnitude, 1);
        return;
      }
      if (held === key) return; // another thread has it (or is writing it)
      slot = (slot + 1) & MASK;
    }
  }
}

// Fibonacci hashing of the 32-bit key onto 18 bits
function hash(key: number): number {
  return Math.imul(key, 0x9e3779b1) >>> 14;
}
