import type { Transaction } from 'sequelize';
import { AuditEvent } from '@/db/models';

/**
 * Writes an audit event. Pass the transaction of the change it describes, so the event and the
 * change are committed (or rolled back) together.
 */
export async function recordAudit(
  event: { actorId: number | null; studyId: number | null; action: string; details?: Record<string, unknown> },
  transaction?: Transaction,
) {
  return AuditEvent.create({ ...event, details: event.details ?? {} }, { transaction });
}
