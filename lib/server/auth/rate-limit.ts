/**
 * Counts failed sign-ins per (e-mail, address) in a sliding window. In memory: one app process
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

  reset(key: string): void {
    this.failures.delete(key);
  }
}

export const signInLimiter = new FailureLimiter({ limit: 10, windowMs: 15 * 60_000 });
