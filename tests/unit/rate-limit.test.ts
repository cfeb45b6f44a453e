import { describe, expect, it } from 'vitest';
import { FailureLimiter } from '@/lib/server/auth/rate-limit';

describe('the sign-in failure limiter', () => {
  it('blocks at the limit and forgets failures once they leave the window', () => {
    let now = 0;
    const limiter = new FailureLimiter({ limit: 3, windowMs: 1000, now: () => now });
    for (let i = 0; i < 3; i++) limiter.recordFailure('a');
    expect(limiter.isBlocked('a')).toBe(true);
    expect(limiter.isBlocked('b')).toBe(false);
    now = 1001;
    expect(limiter.isBlocked('a')).toBe(false);
  });

  it('is cleared by a success', () => {
    const limiter = new FailureLimiter({ limit: 2, windowMs: 1000, now: () => 0 });
    limiter.recordFailure('a');
    limiter.reset('a');
    limiter.recordFailure('a');
    expect(limiter.isBlocked('a')).toBe(false);
  });
});
