import { DesignInputError } from '../DesignInputError';

/** Slots per magnitude: room for about 180,000 response vectors of each magnitude at the fill limit. */
const SLOTS = 1 << 18;
const MASK = SLOTS - 1;
const FILL_LIMIT = Math.floor(SLOTS * 0.7);
const MAX_PROBES = 64;
// entries of the log of slots stored here (both magnitudes), in the order they were published
const LOG_CAPACITY = 2 * FILL_LIMIT + 64;
// bytes: rates (8 per slot, both magnitudes), then keys and states (4 each), then the fill
// counters, then the log's length and the log (slot + 1 per entry, 0 where not yet written)
const RATES_BYTES = 2 * SLOTS * 8;
const KEYS_BYTES = 2 * SLOTS * 4;
const LOG_OFFSET = RATES_BYTES + 2 * KEYS_BYTES + 8;
const BUFFER_BYTES = LOG_OFFSET + 4 + LOG_CAPACITY * 4;
/** Bytes per entry of exportEntries: the key (4), magnitude and state (1), the rate (8). */
const ENTRY_BYTES = 13;

/** The most items per magnitude whose response vectors the table holds: a leading 1 and 30 answers fit a 32-bit key. */
export const SHARED_MAX_ITEMS = 30;

/** A buffer for SharedEstimates, about 9 MB; give the same buffer to every thread of a run. */
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
 *
 * Estimates computed here are also logged in the order they were published, so a worker process can
 * hand them to worker processes elsewhere (exportEntries) and store theirs (importEntries): the
 * same estimates, computed once between processes as well as between threads.
 */
export class SharedEstimates {
  private readonly rates: Float64Array;
  private readonly keys: Int32Array;
  private readonly states: Int32Array;
  private readonly filled: Int32Array;
  private readonly logLength: Int32Array;
  private readonly log: Int32Array;

  /** @throws DesignInputError when `buffer` is not one made by sharedEstimateBuffer */
  constructor(buffer: SharedArrayBuffer) {
    if (!(buffer instanceof SharedArrayBuffer) || buffer.byteLength !== BUFFER_BYTES) throw new DesignInputError('sharedEstimates', 'a buffer made by sharedEstimateBuffer()', buffer);
    this.rates = new Float64Array(buffer, 0, 2 * SLOTS);
    this.keys = new Int32Array(buffer, RATES_BYTES, 2 * SLOTS);
    this.states = new Int32Array(buffer, RATES_BYTES + KEYS_BYTES, 2 * SLOTS);
    this.filled = new Int32Array(buffer, RATES_BYTES + 2 * KEYS_BYTES, 2);
    this.logLength = new Int32Array(buffer, LOG_OFFSET, 1);
    this.log = new Int32Array(buffer, LOG_OFFSET + 4, LOG_CAPACITY);
  }

  /**
   * The stored estimate of response vector `key` (a leading 1, then up to SHARED_MAX_ITEMS answer
   * bits) of a magnitude (0 small, 1 large): its slot, or −1 when none is published. Read it with
   * rateAt, flaggedAt and fallbackAt.
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

  /** Whether the estimate in a slot find returned is flagged. */
  flaggedAt(at: number): boolean {
    return (this.states[at] & 2) !== 0;
  }

  /** Whether the estimate in a slot find returned sends the participant to the fallback set. */
  fallbackAt(at: number): boolean {
    return (this.states[at] & 4) !== 0;
  }

  /** How many estimates of a magnitude are stored. */
  stored(magnitude: 0 | 1): number {
    return Atomics.load(this.filled, magnitude);
  }

  /** Whether a magnitude's table has reached its fill limit (nothing more is stored there). */
  full(magnitude: 0 | 1): boolean {
    return Atomics.load(this.filled, magnitude) >= FILL_LIMIT;
  }

  /** Stores an estimate (first writer wins; a full table or a long probe stores nothing) and logs it for exportEntries. */
  store(magnitude: 0 | 1, key: number, rate: number, flagged: boolean, fallback: boolean): void {
    const at = this.insert(magnitude, key, rate, 1 | (flagged ? 2 : 0) | (fallback ? 4 : 0));
    if (at < 0) return;
    const entry = Atomics.add(this.logLength, 0, 1);
    if (entry < LOG_CAPACITY) Atomics.store(this.log, entry, at + 1);
  }

  /**
   * The estimates stored (by store) after the first `from` of the log, encoded for importEntries in
   * another process, and where the next export starts. An entry still being written when this reads
   * ends the export; the next one picks it up.
   */
  exportEntries(from: number): { entries: Uint8Array; next: number } {
    const end = Math.min(Atomics.load(this.logLength, 0), LOG_CAPACITY);
    let next = from;
    while (next < end && Atomics.load(this.log, next) !== 0) next++;
    const entries = new Uint8Array((next - from) * ENTRY_BYTES);
    const view = new DataView(entries.buffer);
    for (let entry = from, offset = 0; entry < next; entry++, offset += ENTRY_BYTES) {
      const at = this.log[entry] - 1;
      view.setInt32(offset, this.keys[at]);
      view.setUint8(offset + 4, (at >= SLOTS ? 8 : 0) | this.states[at]);
      view.setFloat64(offset + 5, this.rates[at]);
    }
    return { entries, next };
  }

  /**
   * Stores estimates another process exported (exportEntries), without logging them again, and
   * returns how many were new here.
   * @throws DesignInputError when `entries` is not a whole number of exported entries
   */
  importEntries(entries: Uint8Array): number {
    if (!(entries instanceof Uint8Array) || entries.length % ENTRY_BYTES !== 0) throw new DesignInputError('entries', `bytes from exportEntries (a multiple of ${ENTRY_BYTES})`, entries?.length);
    const view = new DataView(entries.buffer, entries.byteOffset, entries.byteLength);
    let added = 0;
    for (let offset = 0; offset < entries.length; offset += ENTRY_BYTES) {
      const key = view.getInt32(offset);
      const tag = view.getUint8(offset + 4);
      if (!(key > 0 && (tag & 1) === 1 && tag < 16)) throw new DesignInputError(`entries[${offset / ENTRY_BYTES}]`, 'an entry from exportEntries (a key above 0, a published state)', `key ${key}, tag ${tag}`);
      if (this.insert(tag & 8 ? 1 : 0, key, view.getFloat64(offset + 5), tag & 7) >= 0) added++;
    }
    return added;
  }

  /** Claims a free slot for `key` and publishes rate and state there: the slot, or −1 when the key is there already or the table is full. */
  private insert(magnitude: 0 | 1, key: number, rate: number, state: number): number {
    if (Atomics.load(this.filled, magnitude) >= FILL_LIMIT) return -1;
    const base = magnitude * SLOTS;
    let slot = hash(key);
    for (let probe = 0; probe < MAX_PROBES; probe++) {
      const at = base + slot;
      const held = Atomics.compareExchange(this.keys, at, 0, key);
      if (held === 0) {
        this.rates[at] = rate;
        Atomics.store(this.states, at, state);
        Atomics.add(this.filled, magnitude, 1);
        return at;
      }
      if (held === key) return -1; // another thread has it (or is writing it)
      slot = (slot + 1) & MASK;
    }
    return -1;
  }
}

// Fibonacci hashing of the 32-bit key onto 18 bits
function hash(key: number): number {
  return Math.imul(key, 0x9e3779b1) >>> 14;
}
