import { z } from 'zod';
import '@/lib/shared/validations/error-map';

/**
 * The item bank's entities, one zod schema each: export options (query string), probe-items
 * request (API body) and batch upload.
 */

export const DELAY_UNITS = ['days', 'weeks', 'months'] as const;

/**
 * Export formats: `csv` a plain CSV (one header row, one row per item: what spreadsheets and
 * survey tools import), `metadata` its JSON sidecar (study, version, hash, seed, units, rules,
 * column meanings), `json` items and metadata in one file, `csv-annotated` the CSV after
 * "#" comment lines carrying the metadata, for readers that skip comments.
 */
export const EXPORT_FORMATS = ['csv', 'metadata', 'json', 'csv-annotated'] as const;

/** Options of an item-bank export or preview, read from the query string. */
export const exportOptionsSchema = z.strictObject({
  format: z.enum(EXPORT_FORMATS).default('json'),
  seed: z.coerce.number().int('The seed must be a whole number.').min(0, 'The seed must be 0 or more.').max(4294967295, 'The seed must be below 2³².').optional(),
  delayUnit: z.enum(DELAY_UNITS).default('days'),
  minGap: z.coerce.number().int().min(1, 'The gap must be at least 1 item.').max(20, 'The gap must be at most 20 items.').default(2),
});
export type ExportOptions = z.infer<typeof exportOptionsSchema>;

export const participantIdSchema = z
  .string({ error: 'Give the participant id as text.' })
  .trim()
  .min(1, 'Give the participant id.')
  .max(128, 'The participant id must be at most 128 characters.')
  .regex(/^[\w.:@-]+$/, 'Use letters, digits and . _ : @ - in participant ids.');

/** POST /api/v1/studies/{id}/probe-items: one participant's calibration responses. */
export const probeItemsRequestSchema = z.strictObject({
  participantId: participantIdSchema,
  responses: z.record(z.string().max(64), z.string().max(16), { error: 'Give responses as an object: item id → "sooner" or "later".' }),
  /** the item-bank id of the calibration items the participant saw (export file header, calibration endpoint); refused when it is not the key's */
  itemBankId: z.string().regex(/^[0-9a-f]{16}$/, 'The item-bank id is 16 hexadecimal digits, as in the export file or the calibration reply.').optional(),
});
export type ProbeItemsRequest = z.infer<typeof probeItemsRequestSchema>;

/** Limits of a batch upload (CSV of calibration responses, one row per participant). */
export const BATCH_MAX_ROWS = 2000;

/** POST /api/studies/{id}/participants/batch: the CSV text and the frozen version to serve it with. */
export const batchRequestSchema = z.strictObject({
  designVersionId: z.number({ error: 'Choose a frozen design version.' }).int().positive('Choose a frozen design version.'),
  csv: z.string().min(1, 'The file is empty.').max(900_000, 'The file is larger than 900 kB; split it.'),
});
export type BatchRequest = z.infer<typeof batchRequestSchema>;
