/**
 * Counts failed sign-ins (or any attempts) per key in a sliding window. In memory: one app process
 * serves a study team, and a restart forgiving old failures is acceptable.
 */
export class FailureLimiter {
  private readonly failures = new Map<string, number[]>();

  constructor(
    private readonly options: { limit: number; windowMs: number; now?: () => number } = { limit: 10, windowMs: 15 * 60_000 },
  ) {}

  private now() {
    return this.options.now ? this.options.now() : Date.now();
  }

  private recent(key: string): number[] {
    const cutoff = this.now() - this.options.windowMs;
    const kept = (this.failures.get(key) ?? []).filter((t) => t > cutoff);
    if (kept.length) this.failures.set(key, kept);
    else this.failures.delete(key);
    return kept;
  }

  /** True when the key has used up its failures in the current window. */
  isBlocked(key: string): boolean {
    return this.recent(key).length >= this.options.limit;
  }

  recordFailure(key: string): void {
    this.failures.set(key, [...this.recent(key), this.now()]);
  }

  /** Counts one attempt unless the key is already blocked; false (nothing counted) when it is. */
  tryAttempt(key: string): boolean {
    if (this.isBlocked(key)) return false;
    this.recordFailure(key);
    return true;
  }

  reset(key: string): void {
    this.failures.delete(key);
  }
}

/** Failed sign-ins (and wrong current passwords) per account: 10 in 15 minutes, from any address. */
export const signInAccountLimiter = new FailureLimiter({ limit: 10, windowMs: 15 * 60_000 });
/** Failed sign-ins per client address, whichever accounts they name: 30 in 15 minutes. */
export const signInAddressLimiter = new FailureLimiter({ limit: 30, windowMs: 15 * 60_000 });
