import { z } from 'zod';

// Every server setting, read from the environment through zod in this one module, so a missing or
// malformed one fails loudly with its name instead of surfacing later as a confusing error. Each
// group is parsed when first asked for: a benchmark of the power engine needs no database settings,
// and a script that only migrates needs no mail settings.

const DEFAULT_FROM = 'Switchback <no-reply@switchback.local>';

/** An optional text setting: unset and blank (after trimming) both mean "not set". */
const optionalText = z.preprocess((v) => (typeof v === 'string' && v.trim() !== '' ? v.trim() : undefined), z.string().optional());

/** A positive number with a default; unset, blank or unusable values fall back (documented defaults). */
const positiveOr = (fallback: number) =>
  z.preprocess((v) => {
    const n = Number(v);
    return v !== undefined && v !== '' && Number.isFinite(n) && n > 0 ? n : fallback;
  }, z.number().positive());

const databaseSchema = z.object({
  DB_HOST: z.string().min(1).default('127.0.0.1'),
  DB_PORT: z.coerce.number().int().min(1).max(65535).default(3307),
  DB_NAME: z.string().min(1),
  DB_USER: z.string().min(1),
  DB_PASSWORD: z.string().min(1),
  /** the server's Unix socket on this machine: when set, connections go through it instead of DB_HOST:DB_PORT */
  DB_SOCKET: z.string().min(1).optional(),
});

const authSchema = z.object({
  NEXTAUTH_SECRET: z.string().min(16, 'NEXTAUTH_SECRET must be at least 16 characters'),
});

const proxySchema = z.object({
  // account security: the reverse proxies whose X-Forwarded-For is believed (addresses or CIDR
  // ranges, comma-separated). Empty: rate limits count the address of the connection itself.
  TRUSTED_PROXIES: z
    .string()
    .default('')
    .transform((list) => list.split(',').map((entry) => entry.trim()).filter(Boolean))
    .pipe(z.array(z.union([z.ipv4(), z.ipv6(), z.cidrv4(), z.cidrv6()], { error: 'list IP addresses or CIDR ranges, separated by commas' }))),
});

const mailSchema = z.object({
  SMTP_URL: optionalText,
  MAIL_FROM: optionalText.transform((v) => v ?? DEFAULT_FROM),
  MAILBOX_DIR: optionalText,
  NEXTAUTH_URL: optionalText.transform((v) => (v ?? 'http://127.0.0.1:3000').replace(/\/+$/, '')),
});

const probeApiSchema = z.object({
  PROBE_API_BURST: positiveOr(200),
  PROBE_API_PER_SECOND: positiveOr(100),
  BROWSER_API_BURST: positiveOr(120),
  BROWSER_API_PER_SECOND: positiveOr(30),
  // the participant-facing session page: per client address and link
  SESSION_PAGE_BURST: positiveOr(120),
  SESSION_PAGE_PER_SECOND: positiveOr(10),
});

/** A worker-thread count: a whole number 1 or more (at most 16), anything else undefined (automatic). */
const workerCount = z.preprocess((v) => {
  const n = Number(v);
  return v !== undefined && v !== '' && Number.isInteger(n) && n >= 1 ? Math.min(n, 16) : undefined;
}, z.number().int().min(1).max(16).optional());

const powerSchema = z.object({ POWER_WORKERS: workerCount, ANALYSIS_WORKERS: workerCount });

function parse<T extends z.ZodType>(schema: T): z.infer<T> {
  const parsed = schema.safeParse(process.env);
  if (!parsed.success) {
    const problems = parsed.error.issues.map((i) => `${i.path.join('.')}: ${i.message}`).join('; ');
    throw new Error(`Switchback configuration is incomplete: ${problems}. Run "npm start", which writes .env.local.`);
  }
  return parsed.data;
}

let database: z.infer<typeof databaseSchema> | undefined;
let auth: z.infer<typeof authSchema> | undefined;

/** The database connection settings (DB_*), parsed once; throws naming every missing or invalid one. */
export function databaseEnv() {
  return (database ??= parse(databaseSchema));
}

/** The session-signing secret (NEXTAUTH_SECRET), parsed once. */
export function authEnv() {
  return (auth ??= parse(authSchema));
}

let proxies: z.infer<typeof proxySchema> | undefined;

/** The reverse proxies whose X-Forwarded-For is believed (TRUSTED_PROXIES), parsed once. */
export function proxyEnv() {
  return (proxies ??= parse(proxySchema));
}

/**
 * Mail and link settings, read on every call (not cached), so a test can point SMTP_URL at its own
 * server and the running app follows a changed setting after a restart. `NEXTAUTH_URL` is the base
 * of links in mail, without a trailing slash; `MAILBOX_DIR` is where the local test mail server keeps
 * what it receives (set by scripts/services.mjs).
 */
export function mailEnv() {
  return parse(mailSchema);
}

/**
 * The participant API's rate limits per key: a burst, then a rate per second, for server keys
 * (PROBE_API_*, defaults 200 and 100) and for browser keys (BROWSER_API_*, defaults 120 and 30).
 */
export function probeApiEnv() {
  return parse(probeApiSchema);
}

/** Worker threads, each a whole number 1–16 or undefined (automatic): POWER_WORKERS for power runs, ANALYSIS_WORKERS for results refits. */
export function powerEnv() {
  return parse(powerSchema);
}

// Power-run caps (issue: resource exhaustion): each run may use every core, so at most this many
// run at once in one server process, and at most this many per study; further runs wait, queued,
// and start by themselves when a slot frees. Read on every scheduling decision (not cached), so a
// test or an operator's restart with new values takes effect at once.
const powerLimitsSchema = z.object({
  POWER_MAX_RUNS_PER_SERVER: z.coerce.number().int().min(1).max(64).default(2),
  POWER_MAX_RUNS_PER_STUDY: z.coerce.number().int().min(1).max(64).default(1),
});

/** How many power runs may execute at once: per server process and per study. */
export function powerRunLimits(): { perServer: number; perStudy: number } {
  const limits = parse(powerLimitsSchema);
  return { perServer: limits.POWER_MAX_RUNS_PER_SERVER, perStudy: limits.POWER_MAX_RUNS_PER_STUDY };
}

const publicOriginSchema = z.object({ NEXTAUTH_URL: z.url().optional().or(z.literal('')) });

/**
 * The origin of NEXTAUTH_URL when it is set explicitly (the address users reach the app at behind a
 * proxy), else null: the cross-site check trusts it besides the Host a request was sent to. The
 * link default (127.0.0.1:3000) is not trusted, since under another port it is another origin.
 */
export function configuredOrigin(): string | null {
  const url = parse(publicOriginSchema).NEXTAUTH_URL;
  return url ? new URL(url).origin : null;
}

// Scale-out (issue: several machines): REDIS_URL switches power runs onto the BullMQ queue that
// `npm run worker` processes take chunks from, and moves the session API's per-key rate limit and key
// revocation into Redis so every app process shares them. Unset: everything stays in-process.
const queueSchema = z.object({
  REDIS_URL: z.preprocess(
    (v) => (typeof v === 'string' && v.trim() !== '' ? v.trim() : undefined),
    z.string().regex(/^rediss?:\/\/\S+$/, 'REDIS_URL must look like redis://host:port (or rediss:// for TLS)').optional(),
  ),
  // how long a worker holds a chunk without renewing its lock before another worker takes it over
  QUEUE_LOCK_MS: z.coerce.number().int().min(500).max(600_000).default(30_000),
});

/**
 * The shared Redis (REDIS_URL, unset: none; everything stays in this process) and the queue's lock
 * time (QUEUE_LOCK_MS, default 30 s: a worker that died mid-chunk has its chunk retried elsewhere
 * after about this long). Read on every call, like the power-run caps.
 */
export function queueEnv(): { redisUrl: string | null; lockMs: number } {
  const parsed = parse(queueSchema);
  return { redisUrl: parsed.REDIS_URL ?? null, lockMs: parsed.QUEUE_LOCK_MS };
}

// Real rewards (payouts): the payment provider's API and the scheduler. PAYMENT_API_URL is the SDK's
// base path: the local fake (scripts/fake-payments.mjs, started by npm start and npm test) unless
// set to the real service; without it, payouts stay scheduled with the reason.
const paymentSchema = z.object({
  PAYMENT_API_URL: optionalText.pipe(z.url({ error: 'PAYMENT_API_URL must be a URL (the payment API base path)' }).optional()),
  PAYMENT_API_TOKEN: optionalText,
  PAYMENT_FUNDING_SOURCE: optionalText.transform((v) => v ?? 'balance'),
  PAYMENT_CAMPAIGN_ID: optionalText,
  PAYOUT_MAX_ATTEMPTS: z.coerce.number().int().min(1).max(20).default(5),
  PAYOUT_RETRY_MINUTES: positiveOr(15),
  PAYOUT_SCHEDULER_SECONDS: positiveOr(60),
  PAYOUT_SUMMARY_HOUR: z.coerce.number().int().min(0).max(23).default(7),
});

/**
 * Payment provider and payout scheduler settings, read on every call (a test points PAYMENT_API_URL
 * at its own fake): the API base path and token, funding source (default balance) and campaign,
 * attempts before a payout is failed (default 5), the first retry delay in minutes (15, doubling),
 * the scheduler's interval in seconds (60) and the UTC hour of the operators' daily summary (7).
 */
export function paymentEnv() {
  return parse(paymentSchema);
}
