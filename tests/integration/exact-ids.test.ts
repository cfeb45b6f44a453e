// Identifiers are exact: participant ids that differ only by letter case are two participants,
// and every identifier column compares bytes, not letters (migration 0008).
import { QueryTypes } from 'sequelize';
import { beforeAll, describe, expect, it } from 'vitest';
import { db } from '@/db';
import { COLUMNS } from '@/db/migrations/0008-exact-identifiers';
import { Participant } from '@/db/models';
import { POST as createKey } from '@/app/api/studies/[id]/api-keys/route';
import { handleProbeItems } from '@/lib/server/http/probe-endpoint';
import { bankFor } from '@/lib/shared/item-bank-plan';
import { ctx, makeStudyWithTeam, migrateUp, requestAs } from '../support/integration';
import { answersOf, makeFrozenVersion } from './item-bank-support';

beforeAll(migrateUp);

describe('exact identifiers', () => {
  it('serves "P1" and "p1" as two participants', async () => {
    const { study, team } = await makeStudyWithTeam('Exact ids');
    const version = await makeFrozenVersion(study.id);
    const reply = await createKey(await requestAs(team.operator, 'POST', `/api/studies/${study.id}/api-keys`, { json: { name: 'Survey', designVersionId: version.id } }), ctx({ id: String(study.id) }));
    const { secret } = (await reply.json()) as { secret: string };
    const items = bankFor(version).bank.items;
    const serve = (participantId: string, rates: { kSmall: number; kLarge: number }) =>
      handleProbeItems({ studyId: String(study.id), authorization: `Bearer ${secret}`, readBody: async () => JSON.stringify({ participantId, responses: answersOf(items, rates) }) });

    expect((await serve('P1', { kSmall: 0.05, kLarge: 0.01 })).status).toBe(200);
    // Different answers under the other case: a new participant, not a conflict with P1.
    expect((await serve('p1', { kSmall: 0.002, kLarge: 0.001 })).status).toBe(200);
    const rows = await Participant.findAll({ where: { studyId: study.id }, order: [['id', 'ASC']] });
    expect(rows.map((r) => r.participantId)).toEqual(['P1', 'p1']);
    expect(await Participant.count({ where: { studyId: study.id, participantId: 'P1' } })).toBe(1);
  });

  it('gives every identifier column a binary collation', async () => {
    const rows = await db().query<{ name: string; collation: string }>(
      `SELECT CONCAT(table_name, '.', column_name) AS name, collation_name AS collation FROM information_schema.columns WHERE table_schema = DATABASE()`,
      { type: QueryTypes.SELECT },
    );
    const collations = new Map(rows.map((r) => [r.name, r.collation]));
    for (const { table, column } of COLUMNS) expect(collations.get(`${table}.${column}`), `${table}.${column}`).toBe('utf8mb4_bin');
  });
});
