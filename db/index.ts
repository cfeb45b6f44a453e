import { Sequelize } from 'sequelize';
import * as mariadb from 'mariadb';
import { serverEnv } from '@/lib/env';
import { registerModels } from './models';

// One Sequelize instance per process. In development Next reloads modules on every change, so the
// instance lives on globalThis to avoid opening a new pool each time.
const holder = globalThis as unknown as { switchbackSequelize?: Sequelize };

function createSequelize(): Sequelize {
  const env = serverEnv();
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

/** Closes the pool (tests and scripts call this before exiting). */
export async function closeDb(): Promise<void> {
  if (holder.switchbackSequelize) {
    const s = holder.switchbackSequelize;
    holder.switchbackSequelize = undefined;
    modelsRegisteredHere = false;
    await s.close();
  }
}
