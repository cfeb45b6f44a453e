import { QueryTypes, type QueryInterface } from 'sequelize';
import type { MigrationParams } from 'umzug';

/**
 * Identifiers compare exactly. The tables were created with the database's case-insensitive
 * collation (utf8mb4_unicode_ci), under which "P1" and "p1" are one participant, and a stage-2
 * answer for item "Cal-01" would land on "cal-01". Each identifier column gets the binary
 * collation utf8mb4_bin: participant ids, item ids, API-key prefixes, and the hex digests that
 * stand for keys, link tokens and frozen designs.
 *
 * Tables of a later migration (0009: participant sessions, stage-2 answers) are changed here when
 * they already exist (a database that applied 0009 first); on a fresh database 0009 creates them
 * with the binary collation itself.
 */
export const COLUMNS: ReadonlyArray<{ table: string; column: string; type: string }> = [
  { table: 'participants', column: 'participant_id', type: 'VARCHAR(128)' },
  { table: 'participant_sessions', column: 'participant_id', type: 'VARCHAR(128)' },
  { table: 'stage2_answers', column: 'item_id', type: 'VARCHAR(64)' },
  { table: 'api_keys', column: 'prefix', type: 'VARCHAR(16)' },
  { table: 'api_keys', column: 'secret_hash', type: 'CHAR(64)' },
  { table: 'invitations', column: 'token_hash', type: 'CHAR(64)' },
  { table: 'password_reset_tokens', column: 'token_hash', type: 'CHAR(64)' },
  { table: 'design_versions', column: 'hash', type: 'CHAR(64)' },
];

async function existingTables(q: QueryInterface): Promise<Set<string>> {
  const rows = await q.sequelize.query<{ name: string }>('SELECT table_name AS name FROM information_schema.tables WHERE table_schema = DATABASE()', { type: QueryTypes.SELECT });
  return new Set(rows.map((r) => r.name));
}

async function setCollation(q: QueryInterface, collation: (table: string) => Promise<string>) {
  const tables = await existingTables(q);
  for (const { table, column, type } of COLUMNS) {
    if (!tables.has(table)) continue;
    await q.sequelize.query(`ALTER TABLE \`${table}\` MODIFY \`${column}\` ${type} CHARACTER SET utf8mb4 COLLATE ${await collation(table)} NOT NULL`);
  }
}

export async function up({ context: q }: MigrationParams<QueryInterface>) {
  await setCollation(q, async () => 'utf8mb4_bin');
}

/** The table's own default collation (what its columns had before `up`). */
async function tableCollation(q: QueryInterface, table: string): Promise<string> {
  const [row] = await q.sequelize.query<{ collation: string }>(
    'SELECT table_collation AS collation FROM information_schema.tables WHERE table_schema = DATABASE() AND table_name = ?',
    { replacements: [table], type: QueryTypes.SELECT },
  );
  return /^utf8mb4_\w+$/.test(row?.collation ?? '') ? row!.collation : 'utf8mb4_unicode_ci';
}

export async function down({ context: q }: MigrationParams<QueryInterface>) {
  // The older schema cannot hold two participants whose ids differ only by case: the later one goes.
  const tables = await existingTables(q);
  for (const table of ['participant_sessions', 'participants']) {
    if (!tables.has(table)) continue;
    await q.sequelize.query(
      `DELETE later FROM \`${table}\` later JOIN \`${table}\` earlier
         ON earlier.study_id = later.study_id AND earlier.id < later.id
        AND LOWER(earlier.participant_id) = LOWER(later.participant_id)`,
    );
  }
  await setCollation(q, (table) => tableCollation(q, table));
}
