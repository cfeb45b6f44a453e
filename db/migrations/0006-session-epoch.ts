import { DataTypes, type QueryInterface } from 'sequelize';
import type { MigrationParams } from 'umzug';

// A counter carried in every session token: raising it (a password reset) ends every session
// signed in before, on every device.
export async function up({ context: q }: MigrationParams<QueryInterface>) {
  await q.addColumn('users', 'session_epoch', { type: DataTypes.INTEGER.UNSIGNED, allowNull: false, defaultValue: 0 });
}

export async function down({ context: q }: MigrationParams<QueryInterface>) {
  await q.removeColumn('users', 'session_epoch');
}
