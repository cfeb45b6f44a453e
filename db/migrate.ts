// `npm run db:migrate` (up to the newest) and `npm run db:migrate:undo` (one step back;
// `-- --all` undoes everything). Reads DB_* from the environment or .env.local.
import { loadLocalEnv } from './load-env';
import { closeDb, db } from './index';
import { createMigrator } from './migrator';

async function main() {
  loadLocalEnv();
  const direction = process.argv[2] ?? 'up';
  const migrator = createMigrator(db());
  if (direction === 'up') {
    const done = await migrator.up();
    console.log(done.length ? `Applied ${done.length} migration(s): ${done.map((m) => m.name).join(', ')}` : 'Database schema is up to date.');
  } else if (direction === 'down') {
    const all = process.argv.includes('--all');
    const undone = await migrator.down(all ? { to: 0 } : undefined);
    console.log(undone.length ? `Undid: ${undone.map((m) => m.name).join(', ')}` : 'Nothing to undo.');
  } else {
    throw new Error(`Unknown direction "${direction}": use "up" or "down".`);
  }
}

main()
  .then(() => closeDb())
  .catch(async (error) => {
    console.error(error instanceof Error ? error.message : error);
    await closeDb();
    process.exit(1);
  });
