import { z } from 'zod';
import '@/lib/shared/validations/error-map';
import { DELAY_UNITS } from './item-bank';
import { nameText } from '@/lib/shared/validations/text';

/** An origin a browser may call the session API from: scheme, host and port, nothing else. */
export const originSchema = z
  .string()
  .trim()
  .max(200, 'Keep each origin under 200 characters.')
  .regex(/^https?:\/\/[a-z0-9.-]+(:\d{1,5})?$/i, 'Give an origin as scheme://host[:port], without a path (e.g. https://lab.example.org).')
  .transform((o) => o.toLowerCase());

/**
 * Creating an API key: a name people recognise, the frozen design version it serves, its kind,
 * the origins browsers may call from, and the presentation settings (delay unit, gap, seed) that
 * its calibration block, the scoring of answers and an export for it share.
 */
export const apiKeyCreateSchema = z.strictObject({
  name: nameText({ label: 'The key name', min: 1, max: 120, tooShort: 'Name the key (e.g. the survey it is for).', tooLong: 'Keep the name under 120 characters.' }),
  designVersionId: z.number({ error: 'Choose a frozen design version.' }).int().positive('Choose a frozen design version.'),
  kind: z.enum(['server', 'browser']).default('server'),
  allowedOrigins: z.array(originSchema).max(20, 'At most 20 origins per key.').default([]),
  delayUnit: z.enum(DELAY_UNITS).default('days'),
  minGap: z.number().int().min(1, 'The gap must be at least 1 item.').max(20, 'The gap must be at most 20 items.').default(2),
  seed: z.number().int('The seed must be a whole number.').min(0, 'The seed must be 0 or more.').max(4294967295, 'The seed must be below 2³².').nullable().default(null),
}).superRefine((input, context) => {
  if (input.kind === 'browser' && input.allowedOrigins.length === 0) {
    context.addIssue({ code: 'custom', path: ['allowedOrigins'], message: 'A browser key needs at least one origin it may be used from.' });
  }
});
export type ApiKeyCreateInput = z.input<typeof apiKeyCreateSchema>;
export type ApiKeyCreateParsed = z.output<typeof apiKeyCreateSchema>;
