import { Sequelize } from 'sequelize';
import * as mariadb from 'mariadb';
import { databaseEnv } from '@/lib/server/env';
import { registerModels } from './models';

// One Sequelize instance per process. In development Next reloads modules on every change, so the
// instance lives on globalThis to avoid opening a new pool each time.
const holder = globalThis as unknown as { switchbackSequelize?: Sequelize };

function createSequelize(): Sequelize {
  const env = databaseEnv();
  const sequelize = new Sequelize(env.DB_NAME, env.DB_USER, env.DB_PASSWORD, {
    host: env.DB_HOST,
    port: env.DB_PORT,
    dialect: 'mariadb',
    dialectModule: mariadb,
    logging: false,
    // Fail fast when the server is down, so requests answer 503 quickly instead of hanging. On the
    // server's own machine its Unix socket (DB_SOCKET) carries each statement with less kernel work
    // than TCP on loopback.
    dialectOptions: { connectTimeout: 3000, ...(env.DB_SOCKET ? { socketPath: env.DB_SOCKET } : {}) },
    timezone: '+00:00',
    pool: { max: 20, min: 0, acquire: 5000, idle: 10000 },
    define: { underscored: true },
  });
  return sequelize;
}

// Next bundles server components and route handlers separately, so one process can hold several
// copies of this module (and of the model classes). The connection pool is shared on globalThis;
// each copy registers its own model classes on it the first time it is used.
let modelsRegisteredHere = false;

/** The shared Sequelize instance with every model registered. */
export function db(): Sequelize {
  holder.switchbackSequelize ??= createSequelize();
  if (!modelsRegisteredHere) {
    registerModels(holder.switchbackSequelize);
    modelsRegisteredHere = true;
  }
  return holder.switchbackSequelize;
}

/** What a driver-level statement answers: rows for a SELECT, counts for a write. */
export type RawResult = Record<string, unknown>[] & { affectedRows?: number; insertId?: number | bigint };

/**
 * One statement straight on a pooled driver connection, with the driver's own `?` placeholders
 * (it escapes values while writing the packet). For the probe API's hot path, where Sequelize's
 * replacement escaping, query object and result mapping cost more than the statement itself.
 * Errors are the driver's own (`errno`, `code`); `isDatabaseUnavailable` reads those codes too.
 * Not for statements inside a transaction: use Sequelize there.
 */
export async function rawQuery(sql: string, values: readonly unknown[]): Promise<RawResult> {
  const manager = db().connectionManager;
  const connection = await manager.getConnection({ type: 'write' });
  try {
    return await (connection as unknown as { query(sql: string, values: readonly unknown[]): Promise<RawResult> }).query(sql, values);
  } finally {
    manager.releaseConnection(connection);
  }
}

/**
 * A date as the raw statements take it: DATETIME text in UTC, as Sequelize writes dates with the
 * pool's +00:00 time zone (a column of whole seconds keeps whole seconds).
 */
export function sqlDate(date: Date): string {
  return date.toISOString().slice(0, 23).replace('T', ' ');
}

/** One statement of a pipeline: SQL with `?` placeholders and its values (strings, numbers or null). */
export type RawStatement = readonly [sql: string, values: readonly unknown[]];

type Prepared = { execute(values: readonly unknown[]): Promise<RawResult>; close(): void };
type PreparingConnection = { prepare(sql: string): Promise<Prepared> };

/**
 * Several statements on one pooled driver connection, each sent without waiting for the reply to
 * the one before (the driver pipelines them: one round trip for the lot), as prepared statements
 * (the server parses a statement's text once per connection; values travel in binary, so a long
 * JSON text is neither escaped here nor lexed there). For the session API's hot path.
 *
 * Each statement runs on its own (autocommit), in the order given, and a later one runs even when
 * an earlier one failed: when it must depend on an earlier one, say so in its SQL (`ROW_COUNT()`
 * is the number of rows the statement before it wrote, -1 after an error). Pass dates as text
 * (sqlDate), not Date objects. Resolves with every statement's outcome, in order.
 */
export async function rawPipeline(statements: readonly RawStatement[]): Promise<PromiseSettledResult<RawResult>[]> {
  const manager = db().connectionManager;
  const connection = (await manager.getConnection({ type: 'write' })) as unknown as PreparingConnection;
  try {
    // All prepared (from the connection's cache once it has seen the text) before any is executed:
    // the driver's own execute() may send a later statement's execution before an earlier one's
    // when only the later one is cached, and the order is what makes ROW_COUNT() mean anything.
    const prepared = await Promise.allSettled(statements.map(([sql]) => connection.prepare(sql)));
    try {
      // Called in order, so the executions are queued, sent and run in order.
      return await Promise.allSettled(prepared.map((p, i) => (p.status === 'fulfilled' ? p.value.execute(statements[i][1]) : Promise.reject(p.reason))));
    } finally {
      for (const p of prepared) if (p.status === 'fulfilled') p.value.close();
    }
  } finally {
    manager.releaseConnection(connection as never);
  }
}

/** One statement as rawPipeline sends it (prepared; dates as UTC text): its result, or its error thrown. */
export async function rawExecute(sql: string, values: readonly unknown[]): Promise<RawResult> {
  return settled((await rawPipeline([[sql, values]]))[0]);
}

/** The outcome of a pipelined statement: its result, or its error thrown. */
export function settled<T>(outcome: PromiseSettledResult<T>): T {
  if (outcome.status === 'rejected') throw outcome.reason;
  return outcome.value;
}

/** Closes the pool (tests and scripts call this before exiting). */
export async function closeDb(): Promise<void> {
  if (holder.switchbackSequelize) {
    const s = holder.switchbackSequelize;
    holder.switchbackSequelize = undefined;
    modelsRegisteredHere = false;
    await s.close();
  }
}
