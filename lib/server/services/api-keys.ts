import { createHash, randomBytes } from 'node:crypto';
import { ApiKey, DesignVersion, User } from '@/db/models';
import { db } from '@/db';
import { NotFoundError, UnauthorizedError } from '@/lib/server/errors';
import { apiKeyCreateSchema, type ApiKeyCreateInput } from '@/lib/shared/validations/api-keys';
import { recordAudit } from './audit';
import { bankOrInvalid, loadVersion } from './item-bank';
import { itemBankId, presentationOf } from './item-bank-id';
import { decodeJson } from '@/db/json';
import { withRequestRedis } from '@/lib/server/redis';

/** SHA-256 (hex) of a key's secret: the only form in which a key is stored. */
export function hashSecret(secret: string): string {
  return createHash('sha256').update(secret).digest('hex');
}

/**
 * Creates a key for one frozen design version. The secret (`sbk_` + 8 characters of prefix +
 * `_` + 32 random base64url characters, 192 bits) is returned once and never stored.
 */
export async function createApiKey(actorId: number, studyId: number, raw: ApiKeyCreateInput) {
  const input = apiKeyCreateSchema.parse(raw);
  const version = await loadVersion(studyId, input.designVersionId);
  bankOrInvalid(version, { delayUnit: input.delayUnit, minGap: input.minGap, seed: input.seed ?? undefined }); // refuse a key for a design that cannot serve items
  const prefix = `sbk_${randomBytes(6).toString('base64url')}`;
  const secret = `${prefix}_${randomBytes(24).toString('base64url')}`;
  const key = await db().transaction(async (transaction) => {
    const created = await ApiKey.create(
      {
        studyId, designVersionId: version.id, name: input.name, prefix, secretHash: hashSecret(secret), createdBy: actorId, lastUsedAt: null, revokedAt: null, revokedBy: null,
        kind: input.kind, allowedOrigins: input.allowedOrigins, delayUnit: input.delayUnit, minGap: input.minGap, seed: input.seed,
      },
      { transaction },
    );
    await recordAudit(
      { actorId, studyId, action: 'api-key.create', details: { keyId: created.id, name: input.name, prefix, designVersionId: version.id, kind: input.kind, allowedOrigins: input.allowedOrigins, delayUnit: input.delayUnit, minGap: input.minGap, seed: input.seed } },
      transaction,
    );
    return created;
  });
  forgetStudyOrigins(studyId);
  return { key: apiKeyJson(key, null, version.hash), secret };
}

export type ApiKeyDto = ReturnType<typeof apiKeyJson>;

function apiKeyJson(key: ApiKey, creator: { name: string } | null, versionHash: string | null) {
  const presentation = versionHash ? presentationOf(versionHash, { seed: key.seed ?? null, delayUnit: key.delayUnit ?? 'days', minGap: key.minGap ?? 2 }) : null;
  return {
    id: key.id,
    name: key.name,
    prefix: key.prefix,
    kind: key.kind ?? 'server',
    allowedOrigins: key.allowedOrigins ?? [],
    designVersionId: key.designVersionId,
    /** the settings of the items this key presents and scores, and their item-bank id (as in an export with them) */
    presentation,
    itemBankId: presentation && versionHash ? itemBankId(versionHash, presentation) : null,
    createdBy: creator?.name ?? null,
    createdAt: key.createdAt.toISOString(),
    lastUsedAt: key.lastUsedAt ? key.lastUsedAt.toISOString() : null,
    revokedAt: key.revokedAt ? key.revokedAt.toISOString() : null,
  };
}

/** The study's keys (never their secrets), newest first. */
export async function listApiKeys(studyId: number) {
  db();
  const rows = await ApiKey.findAll({ where: { studyId }, include: [{ model: User, as: 'creator', attributes: ['name'] }], order: [['createdAt', 'DESC'], ['id', 'DESC']] });
  const hashes = new Map((await DesignVersion.findAll({ where: { studyId }, attributes: ['id', 'hash'] })).map((v) => [v.id, v.hash]));
  return rows.map((k) => apiKeyJson(k, (k as unknown as { creator: User | null }).creator, hashes.get(k.designVersionId) ?? null));
}

/**
 * Revokes a key. It is refused at once everywhere: this process drops it from its cache once
 * the revocation is committed, with REDIS_URL every app process reads the shared set of revoked
 * keys on each request, and every process's probe-items insert reads the key's revoked state in
 * the same statement (serveProbeItems), so a cached key cannot serve another participant.
 */
export async function revokeApiKey(actorId: number, studyId: number, rawKeyId: string) {
  const id = Number(rawKeyId);
  if (!Number.isSafeInteger(id) || id <= 0) throw new NotFoundError('API key not found.');
  db();
  const key = await db().transaction(async (transaction) => {
    const row = await ApiKey.findOne({ where: { id, studyId }, transaction, lock: transaction.LOCK.UPDATE });
    if (!row) throw new NotFoundError('API key not found.');
    if (!row.revokedAt) {
      await row.update({ revokedAt: new Date(), revokedBy: actorId }, { transaction });
      await recordAudit({ actorId, studyId, action: 'api-key.revoke', details: { keyId: row.id, name: row.name, prefix: row.prefix } }, transaction);
    }
    return row;
  });
  // After the commit: a lookup that read the row before it would otherwise cache it as active.
  forgetApiKey(key.secretHash);
  forgetStudyOrigins(studyId);
  await announceRevoked(key.id); // Redis unreachable: 503, and a retry announces it again
  return apiKeyJson(key, null, null);
}

export type CachedKey = {
  id: number;
  studyId: number;
  designVersionId: number;
  revoked: boolean;
  kind: 'server' | 'browser';
  allowedOrigins: string[];
  delayUnit: 'days' | 'weeks' | 'months';
  minGap: number;
  seed: number | null;
};

/**
 * Key lookups by hashed secret, cached in this process for KEY_CACHE_MS so the hot path of the
 * probe-items API does not query the database for every request. The cache only saves the
 * lookup: whether a key is revoked is read again by the statement that records a participant
 * (serveProbeItems), so a key revoked through another process serves nobody; within the TTL
 * such a key can still be told 422 (bad responses) or 429 instead of 401. `generation` makes a
 * lookup that raced with a revocation in this process skip the cache.
 *
 * The cache lives on globalThis: in production one process holds two copies of this module (Next's
 * bundle, which revokes keys, and the one scripts/serve.mjs loads to answer the probe API), and a
 * revocation through either must reach the cache the other reads.
 */
type KeyCacheState = { keys: Map<string, { key: CachedKey | null; expires: number }>; generation: number; lastUsedWritten: Map<number, number> };
const cacheHolder = globalThis as unknown as { switchbackApiKeyCache?: KeyCacheState };
const cache = (cacheHolder.switchbackApiKeyCache ??= { keys: new Map(), generation: 0, lastUsedWritten: new Map() });
const keyCache = cache.keys;
const lastUsedWritten = cache.lastUsedWritten;
export const KEY_CACHE_MS = 10_000;
const KEY_CACHE_LIMIT = 10_000;
const LAST_USED_EVERY_MS = 60_000;

function forgetApiKey(secretHash: string): void {
  cache.generation++;
  keyCache.delete(secretHash);
}

// With REDIS_URL, app processes share the set of revoked key ids: a revocation through one process
// is seen by the next request to any other, whose cache may still hold the key as active.
const REVOKED_KEYS = 'switchback:api-keys:revoked';

async function announceRevoked(keyId: number): Promise<void> {
  await withRequestRedis((redis) => redis.sadd(REVOKED_KEYS, String(keyId)));
}

async function revokedElsewhere(keyId: number): Promise<boolean> {
  return (await withRequestRedis((redis) => redis.sismember(REVOKED_KEYS, String(keyId)))) === 1;
}

/** Marks a cached key revoked after the database refused it (revoked through another process). */
export function markApiKeyRevoked(key: CachedKey): void {
  key.revoked = true;
}

/**
 * 401 for a key that was recognised but has been revoked. It carries the key, so the reply can
 * still carry the CORS headers of the origins that key listed: the page that holds it can read
 * why it is refused instead of seeing an opaque network error.
 */
export class RevokedKeyError extends UnauthorizedError {
  constructor(readonly key: CachedKey) {
    super('This API key is unknown or has been revoked.');
  }
}

/**
 * The API key sent in an Authorization header value (`Bearer <key>`, null when the header is
 * missing) for `studyId`. Missing, unknown or revoked → 401; a valid key of another study → 404
 * (the study does not leak).
 */
export async function requireApiKey(authorization: string | null, studyId: number): Promise<CachedKey> {
  const header = authorization ?? '';
  const match = /^Bearer\s+(\S+)$/i.exec(header);
  if (!match) throw new UnauthorizedError('Send the study\'s API key as "Authorization: Bearer <key>".');
  const hash = hashSecret(match[1]);
  const now = Date.now();
  const hit = keyCache.get(hash);
  let key = hit && hit.expires > now ? hit.key : undefined;
  if (key === undefined) {
    const startedAt = cache.generation;
    db();
    const row = await ApiKey.findOne({ where: { secretHash: hash }, attributes: ['id', 'studyId', 'designVersionId', 'revokedAt', 'kind', 'allowedOrigins', 'delayUnit', 'minGap', 'seed'] });
    key = row
      ? {
          id: row.id, studyId: row.studyId, designVersionId: row.designVersionId, revoked: row.revokedAt !== null,
          kind: row.kind ?? 'server', allowedOrigins: parseOrigins(row.allowedOrigins), delayUnit: row.delayUnit ?? 'days', minGap: row.minGap ?? 2, seed: row.seed ?? null,
        }
      : null;
    if (startedAt === cache.generation) {
      if (keyCache.size >= KEY_CACHE_LIMIT) keyCache.clear();
      keyCache.set(hash, { key, expires: now + KEY_CACHE_MS });
    }
  }
  if (key && !key.revoked && (await revokedElsewhere(key.id))) key.revoked = true;
  if (!key) throw new UnauthorizedError('This API key is unknown or has been revoked.');
  if (key.revoked) throw new RevokedKeyError(key);
  if (key.studyId !== studyId) throw new NotFoundError('Study not found.');
  if (now - (lastUsedWritten.get(key.id) ?? 0) > LAST_USED_EVERY_MS) {
    lastUsedWritten.set(key.id, now);
    const id = key.id;
    // Written at most once a minute per key, outside the request's critical path.
    ApiKey.update({ lastUsedAt: new Date(now) }, { where: { id } }).catch(() => lastUsedWritten.delete(id));
  }
  return key;
}

/** The allowed origins of a key (a JSON column): the strings among them. */
function parseOrigins(raw: unknown): string[] {
  const value = decodeJson(raw);
  return Array.isArray(value) ? value.filter((o): o is string => typeof o === 'string') : [];
}

// The origins any active key of a study lists: what a preflight (which carries no key) is answered
// with. Cached like the keys, on globalThis for the same reason, and dropped on create and revoke.
const originsHolder = globalThis as unknown as { switchbackStudyOrigins?: Map<number, { origins: Set<string>; expires: number }> };
const studyOrigins = (originsHolder.switchbackStudyOrigins ??= new Map());

function forgetStudyOrigins(studyId: number): void {
  studyOrigins.delete(studyId);
}

/** Every origin listed by an active key of the study (cached for KEY_CACHE_MS). */
export async function allowedOriginsOfStudy(studyId: number): Promise<Set<string>> {
  const now = Date.now();
  const hit = studyOrigins.get(studyId);
  if (hit && hit.expires > now) return hit.origins;
  db();
  const rows = await ApiKey.findAll({ where: { studyId, revokedAt: null }, attributes: ['allowedOrigins'] });
  const origins = new Set(rows.flatMap((r) => parseOrigins(r.allowedOrigins)));
  if (studyOrigins.size >= KEY_CACHE_LIMIT) studyOrigins.clear();
  studyOrigins.set(studyId, { origins, expires: now + KEY_CACHE_MS });
  return origins;
}
