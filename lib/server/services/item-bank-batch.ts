import Papa from 'papaparse';
import type { DesignVersion } from '@/db/models';
import { ApiError, ValidationError } from '@/lib/server/errors';
import { BATCH_MAX_ROWS, participantIdSchema } from '@/lib/shared/validations/item-bank';
import { personRecordsCsv, restoreCell } from '@/lib/shared/csv';
import { serveProbeItems, type ProbeItemsReply } from './participants';

export type BatchResult =
  | { participantId: string; line: number; status: 'served'; reply: ProbeItemsReply }
  | { participantId: string; line: number; status: 'refused'; httpStatus: number; message: string; issues: Array<{ path: string; message: string }> };

/**
 * Batch mode for calibration answers collected offline. The CSV has a `participantId` column
 * and one column per calibration item id (values `sooner` or `later`; the column
 * `check-calibration` is optional). Each row is served exactly as the API would serve it
 * (same idempotency and 409 rule); a row that fails is reported and the others still go through.
 */
export async function serveBatch(version: DesignVersion, csv: string, userId: number): Promise<BatchResult[]> {
  const parsed = Papa.parse<Record<string, string>>(csv.replace(/^\uFEFF/, ''), { header: true, skipEmptyLines: 'greedy', transformHeader: (h) => h.trim() });
  const fields = parsed.meta.fields ?? [];
  if (!fields.includes('participantId')) throw new ValidationError([{ path: 'csv', message: 'The first line must name the columns, including participantId.' }]);
  if (parsed.data.length === 0) throw new ValidationError([{ path: 'csv', message: 'The file has no participant rows.' }]);
  if (parsed.data.length > BATCH_MAX_ROWS) throw new ValidationError([{ path: 'csv', message: `At most ${BATCH_MAX_ROWS} participants per file; split it.` }]);
  const results: BatchResult[] = [];
  for (const [index, row] of parsed.data.entries()) {
    const line = index + 2;
    const id = participantIdSchema.safeParse(restoreCell(row.participantId ?? ''));
    if (!id.success) {
      results.push({ participantId: row.participantId ?? '', line, status: 'refused', httpStatus: 422, message: id.error.issues[0].message, issues: [] });
      continue;
    }
    const responses: Record<string, string> = {};
    for (const field of fields) {
      const value = (row[field] ?? '').trim().toLowerCase();
      if (field !== 'participantId' && value !== '') responses[field] = value;
    }
    try {
      results.push({ participantId: id.data, line, status: 'served', reply: await serveProbeItems(version, id.data, responses, { source: 'batch', userId }) });
    } catch (error) {
      if (!(error instanceof ApiError) || error.status >= 500) throw error;
      results.push({ participantId: id.data, line, status: 'refused', httpStatus: error.status, message: error.message, issues: error.issues ?? [] });
    }
  }
  return results;
}

/** Batch results as CSV: one row per served item, and one row per refused participant with the reason; the caution in the last column. */
export function batchCsv(results: readonly BatchResult[]): string {
  const rows = results.flatMap((r): Record<string, unknown>[] =>
    r.status === 'served'
      ? r.reply.items.map((item) => ({ participantId: r.participantId, status: 'served', flag: r.reply.flag ?? '', kSmall: r.reply.estimates.kSmall.rate, kLarge: r.reply.estimates.kLarge.rate, message: '', ...item }))
      : [{ participantId: r.participantId, status: 'refused', flag: '', kSmall: '', kLarge: '', message: [r.message, ...r.issues.map((i) => `${i.path}: ${i.message}`)].join(' | ') }],
  );
  const fields = ['participantId', 'status', 'flag', 'kSmall', 'kLarge', 'message', 'id', 'block', 'role', 'set', 'view', 'pairId', 'soonerAmount', 'soonerDelay', 'laterAmount', 'laterDelay', 'soonerSide', 'position', 'text'];
  return personRecordsCsv({ records: rows, columns: fields });
}
