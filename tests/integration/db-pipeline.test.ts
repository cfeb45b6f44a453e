// rawPipeline (db/index.ts) on the real MariaDB: the session API's hot path sends several
// statements in one round trip and relies on them running in the order given (a later statement
// reads what an earlier one wrote, or asks ROW_COUNT() whether it wrote anything).
import { beforeAll, describe, expect, it } from 'vitest';
import { randomUUID } from 'node:crypto';
import { rawExecute, rawPipeline, settled } from '@/db';
import { Study } from '@/db/models';
import { migrateUp } from '../support/integration';

const COUNT = 'SELECT COUNT(*) AS n FROM studies WHERE name = ?';
const insertStudy = (tag: string) => `INSERT INTO studies (name, description, version, created_at, updated_at) /* ${tag} */ VALUES (?, 'pipeline test', 1, '2026-01-01 00:00:00', '2026-01-01 00:00:00')`;

describe('rawPipeline', () => {
  beforeAll(migrateUp);

  it('runs its statements in the order given, also when only a later one is already prepared on the connection', async () => {
    // The read is prepared on every pooled connection; each insert is a text no connection has seen.
    await Promise.all(Array.from({ length: 25 }, () => rawExecute(COUNT, ['warm-up'])));
    const run = randomUUID().slice(0, 8);
    for (let i = 0; i < 12; i++) {
      const name = `Pipeline ${run} ${i}`;
      const [inserted, counted] = await rawPipeline([[insertStudy(`${run} ${i}`), [name]], [COUNT, [name]]]);
      expect(settled(inserted).affectedRows).toBe(1);
      expect(Number(settled(counted)[0].n), `statement pair ${i}`).toBe(1);
    }
    await Study.destroy({ where: { description: 'pipeline test' } });
  });

  it('runs a later statement after an earlier one failed, and ROW_COUNT() tells it so', async () => {
    const name = `Pipeline ${randomUUID().slice(0, 8)}`;
    const study = await Study.create({ name, description: 'pipeline test' });
    const [failed, guarded] = await rawPipeline([
      ['INSERT INTO studies (id, name, description, version, created_at, updated_at) VALUES (?, ?, ?, 1, NOW(), NOW())', [study.id, name, 'pipeline test']],
      ['SELECT ROW_COUNT() AS written', []],
    ]);
    expect(failed.status).toBe('rejected');
    expect((failed as PromiseRejectedResult).reason).toMatchObject({ errno: 1062 });
    expect(() => settled(failed)).toThrow();
    expect(Number(settled(guarded)[0].written)).toBe(-1);
    await study.destroy();
  });
});

// The private server's Unix socket (DB_SOCKET, from scripts/mariadb.mjs) carries the app's statements;
// an existing server named by TEST_DB_HOST is reached over TCP.
describe.skipIf(Boolean(process.env.TEST_DB_HOST))('the connection to the private server', () => {
  it('goes through its Unix socket (MariaDB names such a client "localhost", a TCP one "127.0.0.1:port")', async () => {
    expect(process.env.DB_SOCKET).toMatch(/mariadbd\.sock$/);
    const [row] = await rawExecute('SELECT host FROM information_schema.processlist WHERE id = CONNECTION_ID()', []);
    expect(row.host).toBe('localhost');
  });
});
