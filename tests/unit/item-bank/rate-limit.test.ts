import { describe, expect, it } from 'vitest';
import { KeyRateLimiter } from '@/lib/server/http/key-rate-limit';

describe('per-key token buckets of the probe-items API', () => {
  it('lets a key burst up to its capacity, then asks it to wait, and refills with time', () => {
    let now = 0;
    const limiter = new KeyRateLimiter(3, 2, () => now);
    expect([limiter.take(1), limiter.take(1), limiter.take(1)]).toEqual([0, 0, 0]);
    expect(limiter.take(1)).toBe(1); // one token takes 0.5 s at 2 a second: Retry-After rounds up to 1 s
    now = 500;
    expect(limiter.take(1)).toBe(0);
    expect(limiter.take(1)).toBeGreaterThan(0);
  });

  it('keeps keys apart', () => {
    const limiter = new KeyRateLimiter(1, 1, () => 0);
    expect(limiter.take(1)).toBe(0);
    expect(limiter.take(1)).toBeGreaterThan(0);
    expect(limiter.take(2)).toBe(0);
  });
});
