import { Redis } from 'ioredis';
import { queueEnv } from '@/lib/server/env';

// One Redis client per address and purpose, kept on globalThis: in production one process holds two
// copies of the server modules (Next's bundle and the participant API that scripts/serve.mjs loads),
// and both should share a connection rather than open one each.
const holder = globalThis as unknown as { switchbackRedis?: Map<string, Redis> };
const clients = (holder.switchbackRedis ??= new Map());

/**
 * The shared Redis client when REDIS_URL is set, else null (everything stays in this process).
 * `queue` clients wait for Redis indefinitely (BullMQ needs that); request clients give up
 * after a few retries so a request fails instead of hanging when Redis is gone.
 */
export function sharedRedis(purpose: 'request' | 'queue' = 'request'): Redis | null {
  const url = queueEnv().redisUrl;
  if (!url) return null;
  const id = `${purpose} ${url}`;
  let client = clients.get(id);
  if (!client) {
    client = new Redis(url, purpose === 'queue' ? { maxRetriesPerRequest: null } : { maxRetriesPerRequest: 2, connectTimeout: 5_000 });
    client.on('error', (error: Error) => console.warn(`[switchback] Redis (${purpose}): ${error.message}`));
    clients.set(id, client);
  }
  return client;
}

/** Closes every shared client (tests, and a worker process on its way out). */
export async function closeSharedRedis(): Promise<void> {
  const all = [...clients.values()];
  clients.clear();
  await Promise.all(all.map((c) => c.quit().catch(() => c.disconnect())));
}
