import { QueryTypes } from 'sequelize';
import { describe, expect, it } from 'vitest';
import { db } from '@/db';
import { createMigrator } from '@/db/migrator';

async function tables(): Promise<string[]> {
  const rows = await db().query<{ name: string }>(
    `SELECT table_name AS name FROM information_schema.tables WHERE table_schema = DATABASE() AND table_name <> 'schema_migrations' ORDER BY table_name`,
    { type: QueryTypes.SELECT },
  );
  return rows.map((r) => r.name);
}

describe('migrations on the real MariaDB', () => {
  it('go up, all the way down, and up again to the same schema', async () => {
    const migrator = createMigrator(db());
    await migrator.up();
    const upTables = await tables();
    expect(upTables).toEqual(expect.arrayContaining(['users', 'studies', 'memberships', 'audit_events']));
    const applied = (await migrator.executed()).map((m) => m.name);

    await migrator.down({ to: 0 });
    expect(await tables()).toEqual([]);
    expect(await migrator.executed()).toEqual([]);

    await migrator.up();
    expect(await tables()).toEqual(upTables);
    expect((await migrator.executed()).map((m) => m.name)).toEqual(applied);
  });
});
