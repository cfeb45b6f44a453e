import type { Redis } from 'ioredis';
import { probeApiEnv } from '@/lib/server/env';
import { withRequestRedis } from '@/lib/server/redis';

/**
 * Token buckets per API key: each key may burst `capacity` requests and then `perSecond` a second.
 * Without REDIS_URL the buckets live in this process's memory (one app process serves a lab); with
 * it they live in Redis (takeShared), so the limit holds across every app process behind one address.
 * Settings: PROBE_API_BURST (default 200) and PROBE_API_PER_SECOND (default 100).
 */
export class KeyRateLimiter {
  private readonly buckets = new Map<number | string, { tokens: number; at: number }>();

  constructor(
    public capacity: number,
    public perSecond: number,
    private readonly now: () => number = () => Date.now(),
    /** names the limiter's buckets in Redis */
    public readonly name = 'probe',
  ) {}

  /** Takes one token for `keyId` (a key id, or any other name of a caller) in this process: 0 when allowed, else the seconds to wait (for Retry-After). */
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

  /**
   * Takes one token for `keyId` from the bucket every app process shares when REDIS_URL is set
   * (the same arithmetic as take, done atomically in Redis on Redis's clock), else from this process's.
   * Redis unreachable: ServiceUnavailableError (503 with Retry-After).
   */
  async takeShared(keyId: number | string): Promise<number> {
    const ttlMs = Math.ceil((this.capacity / Math.max(this.perSecond, 1e-6)) * 1000) + 1000;
    const wait = await withRequestRedis((redis) =>
      withBucketScript(redis).switchbackTakeToken(`switchback:rate:${this.name}:${keyId}`, this.capacity, this.perSecond, Math.min(ttlMs, 86_400_000)),
    );
    return wait === null ? this.take(keyId) : Number(wait);
  }

  /** Forgets every bucket of this process (tests). */
  reset(): void {
    this.buckets.clear();
  }
}

// The bucket refill and take in one script, so two processes taking at once cannot both spend the
// last token. Redis's own clock (TIME) keeps processes on machines with drifting clocks consistent.
const TAKE_TOKEN = `
local capacity = tonumber(ARGV[1])
local perSecond = tonumber(ARGV[2])
local clock = redis.call('TIME')
local now = tonumber(clock[1]) * 1000 + math.floor(tonumber(clock[2]) / 1000)
local bucket = redis.call('HMGET', KEYS[1], 'tokens', 'at')
local tokens = tonumber(bucket[1]) or capacity
local at = tonumber(bucket[2]) or now
tokens = math.min(capacity, tokens + ((now - at) / 1000) * perSecond)
local wait = 0
if tokens >= 1 then
  tokens = tokens - 1
elseif perSecond > 0 then
  wait = math.max(1, math.ceil((1 - tokens) / perSecond))
else
  wait = 60
end
redis.call('HSET', KEYS[1], 'tokens', tostring(tokens), 'at', tostring(now))
redis.call('PEXPIRE', KEYS[1], tonumber(ARGV[3]))
return wait
`;

type WithTakeToken = Redis & { switchbackTakeToken(key: string, capacity: number, perSecond: number, ttlMs: number): Promise<number> };

function withBucketScript(redis: Redis): WithTakeToken {
  const client = redis as WithTakeToken;
  if (typeof client.switchbackTakeToken !== 'function') redis.defineCommand('switchbackTakeToken', { numberOfKeys: 1, lua: TAKE_TOKEN });
  return client;
}

const limits = probeApiEnv();

/** The probe-items API's limiter. */
export const probeRateLimiter = new KeyRateLimiter(limits.PROBE_API_BURST, limits.PROBE_API_PER_SECOND, undefined, 'probe');
