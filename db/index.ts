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
  registerModels(sequelize);
  return sequelize;
}

/** The shared Sequelize instance with every model registered. */
export function db(): Sequelize {
  holder.switchbackSequelize ??= createSequelize();
  return holder.switchbackSequelize;
}

/** Closes the pool (tests and scripts call this before exiting). */
export async function closeDb(): Promise<void> {
  if (holder.switchbackSequelize) {
    const s = holder.switchbackSequelize;
    holder.switchbackSequelize = undefined;
    await s.close();
  }
}
