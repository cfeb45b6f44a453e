import { z } from 'zod';
import '@/lib/shared/validations/error-map';
import { participantIdSchema } from '@/lib/shared/validations/item-bank';

/** GET /api/v1/studies/{id}/calibration: for whom, and whether their block is shuffled for them. */
export const calibrationQuerySchema = z.strictObject({
  participantId: participantIdSchema.optional(),
  order: z.enum(['bank', 'participant'], { error: "Use order=bank (the exported order) or order=participant (shuffled per participant, seeded)." }).default('bank'),
});
export type CalibrationQuery = z.infer<typeof calibrationQuerySchema>;

/** One stage-2 answer as the session API receives it. */
export const stage2AnswerSchema = z.strictObject({
  itemId: z.string({ error: 'Give the item id.' }).min(1, 'Give the item id.').max(64, 'Item ids are at most 64 characters.'),
  chosen: z.enum(['sooner', 'later'], { error: "Choose 'sooner' (the smaller-sooner option) or 'later' (the larger-later one)." }),
  responseTimeMs: z.number().int('Give the response time in whole milliseconds.').min(0, 'The response time cannot be negative.').max(86_400_000, 'The response time must be under a day.').optional(),
  sideShown: z.enum(['left', 'right'], { error: "Give the side the smaller-sooner option was shown on: 'left' or 'right'." }).optional(),
});

/** POST /api/v1/studies/{id}/stage2-answers: some or all of a participant's stage-2 answers. */
export const stage2AnswersRequestSchema = z.strictObject({
  participantId: participantIdSchema,
  answers: z.array(stage2AnswerSchema).max(200, 'At most 200 answers per request.'),
});
export type Stage2AnswersRequest = z.infer<typeof stage2AnswersRequestSchema>;

/** GET /api/studies/{id}/sessions: one status only, and the format. */
export const sessionsQuerySchema = z.strictObject({
  status: z.enum(['started', 'calibrated', 'served', 'completed', 'abandoned'], { error: 'Filter by started, calibrated, served, completed or abandoned.' }).optional(),
  format: z.enum(['json', 'csv']).default('json'),
});

/** PATCH /api/studies/{id}/sessions: after how many idle minutes an unfinished session reads as abandoned. */
export const sessionSettingsSchema = z.strictObject({
  idleMinutes: z.number({ error: 'Give the idle time in minutes.' }).int('Give whole minutes.').min(5, 'At least 5 minutes.').max(43_200, 'At most 30 days (43,200 minutes).'),
});
