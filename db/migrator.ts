import { readdirSync } from 'node:fs';
import path from 'node:path';
import { pathToFileURL } from 'node:url';
import type { QueryInterface, Sequelize } from 'sequelize';
import { SequelizeStorage, Umzug, type MigrationParams } from 'umzug';

const MIGRATIONS_DIR = path.join(process.cwd(), 'db', 'migrations');

type MigrationModule = {
  up: (params: MigrationParams<QueryInterface>) => Promise<void>;
  down: (params: MigrationParams<QueryInterface>) => Promise<void>;
};

/**
 * Umzug over Sequelize. Migrations are the files in db/migrations, applied in file-name order
 * (names start with a four-digit number), and recorded in the `schema_migrations` table.
 */
export function createMigrator(sequelize: Sequelize) {
  const files = readdirSync(MIGRATIONS_DIR)
    .filter((f) => /^\d{4}-.+\.ts$/.test(f))
    .sort();
  return new Umzug<QueryInterface>({
    migrations: files.map((file) => {
      const load = async () => (await import(pathToFileURL(path.join(MIGRATIONS_DIR, file)).href)) as MigrationModule;
      return {
        name: file.replace(/\.ts$/, ''),
        up: async (params) => (await load()).up(params),
        down: async (params) => (await load()).down(params),
      };
    }),
    context: sequelize.getQueryInterface(),
    storage: new SequelizeStorage({ sequelize, tableName: 'schema_migrations' }),
    logger: undefined,
  });
}
