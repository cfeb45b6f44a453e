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
    // Fail fast when the server is down, so requests answer 503 quickly instead of hanging.
    dialectOptions: { connectTimeout: 3000 },
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

/** Closes the pool (tests and scripts call this before exiting). */
export async function closeDb(): Promise<void> {
  if (holder.switchbackSequelize) {
    const s = holder.switchbackSequelize;
    holder.switchbackSequelize = undefined;
    modelsRegisteredHere = false;
    await s.close();
  }
}
