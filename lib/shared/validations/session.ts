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

export const SESSION_STATUS_VALUES = ['started', 'calibrated', 'served', 'completed', 'abandoned'] as const;
const statusSchema = z.enum(SESSION_STATUS_VALUES, { error: 'Filter by started, calibrated, served, completed or abandoned.' });

/** Page sizes the participants list offers (and the API accepts). */
export const PARTICIPANT_PAGE_SIZES = [10, 25, 50, 100] as const;
export const DEFAULT_PARTICIPANT_PAGE_SIZE = 25;

/** Which participants a list or an export covers: part of an id, one session status, one frozen version. */
const participantFilters = {
  q: z.string().trim().max(128, 'Search for at most 128 characters of a participant id.').optional(),
  status: statusSchema.optional(),
  version: z.coerce.number({ error: 'Give the frozen version as its number id.' }).int('Give the frozen version as its number id.').min(1, 'Give the frozen version as its number id.').max(Number.MAX_SAFE_INTEGER, 'Give the frozen version as its number id.').optional(),
  format: z.enum(['json', 'csv'], { error: 'Ask for format=json or format=csv.' }).default('json'),
};

/** GET /api/studies/{id}/sessions: filters (search, status, version) and the format. */
export const sessionsQuerySchema = z.strictObject(participantFilters);

/** GET /api/studies/{id}/participants: filters, the page and its size, and the format (a CSV covers every page). */
export const participantsQuerySchema = z.strictObject({
  ...participantFilters,
  page: z.coerce.number({ error: 'Give the page as a whole number from 1.' }).int('Give the page as a whole number from 1.').min(1, 'Give the page as a whole number from 1.').max(1_000_000, 'Pages go up to 1,000,000.').default(1),
  pageSize: z.coerce
    .number({ error: `Choose a page size of ${PARTICIPANT_PAGE_SIZES.join(', ')}.` })
    .refine((n) => (PARTICIPANT_PAGE_SIZES as readonly number[]).includes(n), `Choose a page size of ${PARTICIPANT_PAGE_SIZES.join(', ')}.`)
    .default(DEFAULT_PARTICIPANT_PAGE_SIZE),
});
export type ParticipantsQuery = z.infer<typeof participantsQuerySchema>;

/**
 * The participants page's query as read from its address: each parameter that does not parse
 * falls back to its default (a pasted or edited link still opens a page), and its name is
 * returned so the page can say what it ignored.
 */
export function readParticipantsQuery(params: URLSearchParams): { query: ParticipantsQuery; ignored: string[] } {
  const fields = participantsQuerySchema.shape;
  const query: Record<string, unknown> = {};
  const ignored: string[] = [];
  for (const [name, schema] of Object.entries(fields)) {
    const raw = params.get(name);
    const parsed = (schema as z.ZodType).safeParse(raw === null || raw === '' ? undefined : raw);
    if (parsed.success) query[name] = parsed.data;
    else {
      ignored.push(name);
      query[name] = (schema as z.ZodType).safeParse(undefined).data;
    }
  }
  for (const name of params.keys()) if (!(name in fields) && !ignored.includes(name)) ignored.push(name);
  return { query: query as ParticipantsQuery, ignored };
}

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
