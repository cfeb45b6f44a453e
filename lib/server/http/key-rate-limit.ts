import { probeApiEnv } from '@/lib/server/env';

/**
 * Token buckets per API key, in this process's memory: each key may burst `capacity` requests
 * and then `perSecond` a second. One app process serves a lab; behind several processes each
 * keeps its own buckets, so the effective limit is per process (documented in the API docs).
 * Settings: PROBE_API_BURST (default 200) and PROBE_API_PER_SECOND (default 100).
 */
export class KeyRateLimiter {
  private readonly buckets = new Map<number | string, { tokens: number; at: number }>();

  constructor(
    public capacity: number,
    public perSecond: number,
    private readonly now: () => number = () => Date.now(),
  ) {}

  /** Takes one token for `keyId` (a key id, or any other name of a caller): 0 when allowed, else the seconds to wait (for Retry-After). */
  take(keyId: number | string): number {
    const t = this.now();
    const bucket = this.buckets.get(keyId) ?? { tokens: this.capacity, at: t };
    bucket.tokens = Math.min(this.capacity, bucket.tokens + ((t - bucket.at) / 1000) * this.perSecond);
    bucket.at = t;
    this.buckets.set(keyId, bucket);
    if (bucket.tokens >= 1) {
      bucket.tokens -= 1;
      return 0;
    }
    return this.perSecond > 0 ? Math.max(1, Math.ceil((1 - bucket.tokens) / this.perSecond)) : 60;
  }

  /** Forgets every bucket (tests). */
  reset(): void {
    this.buckets.clear();
  }
}

const limits = probeApiEnv();

/** The probe-items API's limiter. */
export const probeRateLimiter = new KeyRateLimiter(limits.PROBE_API_BURST, limits.PROBE_API_PER_SECOND);
