// `npm run db:seed`: runs every db/seeders/NN-*.ts in name order. Each seeder is idempotent.
import { readdirSync } from 'node:fs';
import path from 'node:path';
import { pathToFileURL } from 'node:url';
import type { Sequelize } from 'sequelize';
import { loadLocalEnv } from './load-env';
import { closeDb, db } from './index';

/** Runs all seeders against the given instance. */
export async function runSeeders(sequelize: Sequelize): Promise<string[]> {
  const dir = path.join(process.cwd(), 'db', 'seeders');
  const files = readdirSync(dir).filter((f) => /^\d{2}-.+\.ts$/.test(f)).sort();
  for (const file of files) {
    const mod = (await import(pathToFileURL(path.join(dir, file)).href)) as { seed: (s: Sequelize) => Promise<void> };
    await mod.seed(sequelize);
  }
  return files;
}

const isMain = process.argv[1] && pathToFileURL(process.argv[1]).href === import.meta.url;
if (isMain) {
  loadLocalEnv();
  runSeeders(db())
    .then(async (files) => {
      console.log(`Seeded: ${files.join(', ')}`);
      await closeDb();
    })
    .catch(async (error) => {
      console.error(error);
      await closeDb();
      process.exit(1);
    });
}
