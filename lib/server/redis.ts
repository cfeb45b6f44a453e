import { Redis, ReplyError } from 'ioredis';
import { queueEnv } from '@/lib/server/env';
import { ServiceUnavailableError } from '@/lib/server/errors';

// One Redis client per address and purpose, kept on globalThis: in production one process holds two
// copies of the server modules (Next's bundle and the participant API that scripts/serve.mjs loads),
// and both should share a connection rather than open one each.
type Held = { client: Redis; down: boolean; everReady: boolean };
const holder = globalThis as unknown as { switchbackRedisClients?: Map<string, Held> };
const clients = (holder.switchbackRedisClients ??= new Map());

/** How long a request refused for want of Redis asks its caller to wait (Retry-After, seconds). */
export const REDIS_RETRY_AFTER_S = 5;

/** What a request refused for want of Redis is told. */
export const REDIS_UNAVAILABLE_MESSAGE =
  'The shared state store (Redis) of this server cannot be reached just now; nothing was recorded. Retry shortly.';

function held(purpose: 'request' | 'queue'): Held | null {
  const url = queueEnv().redisUrl;
  if (!url) return null;
  const id = `${purpose} ${url}`;
  let entry = clients.get(id);
  if (!entry) {
    // request clients retry the connection at least once a second, so a request soon after Redis
    // returns finds it again
    const client = new Redis(
      url,
      purpose === 'queue' ? { maxRetriesPerRequest: null } : { maxRetriesPerRequest: 2, connectTimeout: 5_000, retryStrategy: (times) => Math.min(times * 100, 1000) },
    );
    const state: Held = { client, down: false, everReady: false };
    // once per outage, not once per reconnection attempt: the log says when it went and when it came back
    client.on('error', (error: Error) => {
      if (state.down) return;
      state.down = true;
      console.warn(`[switchback] Redis (${purpose}) at ${url} cannot be reached (${error.message}); ${purpose === 'request' ? 'session API requests are answered 503 until it is back' : 'the queue waits for it'}.`);
    });
    client.on('ready', () => {
      state.everReady = true;
      if (!state.down) return;
      state.down = false;
      console.warn(`[switchback] Redis (${purpose}) at ${url} is reachable again.`);
    });
    entry = state;
    clients.set(id, entry);
  }
  return entry;
}

/**
 * The shared Redis client when REDIS_URL is set, else null (everything stays in this process).
 * `queue` clients wait for Redis indefinitely (BullMQ needs that); request clients give up
 * after a few retries so a request fails instead of hanging when Redis is gone.
 */
export function sharedRedis(purpose: 'request' | 'queue' = 'request'): Redis | null {
  return held(purpose)?.client ?? null;
}

/**
 * Runs `command` on the request client when REDIS_URL is set (else null, and nothing runs). When
 * Redis cannot be reached the request fails with ServiceUnavailableError (503, Retry-After) rather
 * than a 500: at once while a client that was connected is reconnecting, otherwise after the
 * client's few retries. Redis's own refusals (ReplyError: a bad command) pass through unchanged.
 */
export async function withRequestRedis<T>(command: (redis: Redis) => Promise<T>): Promise<T | null> {
  const entry = held('request');
  if (!entry) return null;
  if (entry.everReady && entry.client.status !== 'ready') throw new ServiceUnavailableError(REDIS_UNAVAILABLE_MESSAGE, REDIS_RETRY_AFTER_S);
  try {
    return await command(entry.client);
  } catch (error) {
    if (error instanceof ReplyError) throw error;
    throw new ServiceUnavailableError(REDIS_UNAVAILABLE_MESSAGE, REDIS_RETRY_AFTER_S);
  }
}

/** Closes every shared client (tests, and a worker process on its way out). */
export async function closeSharedRedis(): Promise<void> {
  const all = [...clients.values()].map((entry) => entry.client);
  clients.clear();
  await Promise.all(all.map((c) => c.quit().catch(() => c.disconnect())));
}
