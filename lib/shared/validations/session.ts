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

// Adaptive calibration (issue 17): the session API's "next calibration item" step.
/**
 * POST /api/v1/studies/{id}/calibration-next: step n of a participant's adaptive calibration. Step 0
 * carries no answer and returns the first item; step n ≥ 1 carries the answer to the item step n − 1
 * returned. Sending a step again with the same answer returns the same reply.
 */
export const calibrationNextRequestSchema = z
  .strictObject({
    participantId: participantIdSchema,
    step: z.number({ error: 'Give the step: 0 for the first item, then the number of answers given so far.' }).int('Give the step as a whole number.').min(0, 'The step is 0 or more.').max(200, 'The step is at most 200.'),
    answer: z
      .strictObject({
        itemId: z.string({ error: 'Give the item id.' }).min(1, 'Give the item id.').max(64, 'Item ids are at most 64 characters.'),
        chosen: z.enum(['sooner', 'later'], { error: "Choose 'sooner' (the smaller-sooner option) or 'later' (the larger-later one)." }),
      })
      .optional(),
  })
  .superRefine((body, ctx) => {
    if (body.step === 0 && body.answer) ctx.addIssue({ code: 'custom', path: ['answer'], message: 'Step 0 asks for the first item: send no answer.' });
    if (body.step > 0 && !body.answer) ctx.addIssue({ code: 'custom', path: ['answer'], message: 'Send the answer to the item the previous step returned.' });
  });
export type CalibrationNextRequest = z.infer<typeof calibrationNextRequestSchema>;
