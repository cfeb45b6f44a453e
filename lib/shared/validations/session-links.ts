import { z } from 'zod';
import { paymentDetailsSchema } from '@/lib/shared/validations/payouts';
import '@/lib/shared/validations/error-map';
import { participantIdSchema } from './item-bank';
import { stage2AnswerSchema } from './session';
import { freeText, nameText } from './text';

/** A redirect target after the session: an absolute http(s) URL (the participant id is added to its query). */
export const redirectUrlSchema = z
  .string()
  .trim()
  .max(2000, 'Keep the redirect URL under 2,000 characters.')
  .refine((value) => {
    try {
      const url = new URL(value);
      return (url.protocol === 'https:' || url.protocol === 'http:') && !url.username && !url.password;
    } catch {
      return false;
    }
  }, 'Give the redirect as a full http:// or https:// address (e.g. https://panel.example.org/done).');

/**
 * Creating a participant link: the frozen version it runs, the team's name for it, the heading,
 * consent text and instructions participants read, the completion code (generated when empty),
 * the redirect after the end, and the query parameter the participant id arrives in.
 */
export const sessionLinkCreateSchema = z.strictObject({
  designVersionId: z.number({ error: 'Choose a frozen design version.' }).int().positive('Choose a frozen design version.'),
  name: nameText({ label: 'The link name', min: 1, max: 120, tooShort: 'Name the link (e.g. the panel or wave it is for).' }),
  title: nameText({ label: 'The title', min: 1, max: 160, tooShort: 'Give the title participants see.' }),
  consentText: freeText({ label: 'The consent text', max: 20_000 }).refine((s) => s.trim().length > 0, 'Write the consent text participants agree to.'),
  instructions: freeText({ label: 'The instructions', max: 20_000 }).refine((s) => s.trim().length > 0, 'Write the instructions participants read before the first choice.'),
  completionCode: z
    .string()
    .trim()
    .max(64, 'Keep the completion code under 64 characters.')
    .regex(/^[A-Za-z0-9_-]*$/, 'Use letters, digits, _ and - in the completion code.')
    .default(''),
  redirectUrl: z.union([z.literal(''), redirectUrlSchema]).default(''),
  participantParam: z
    .string()
    .trim()
    .min(1, 'Name the query parameter the participant id arrives in.')
    .max(40, 'Keep the parameter name under 40 characters.')
    .regex(/^[A-Za-z][A-Za-z0-9_]*$/, 'The parameter name starts with a letter and holds letters, digits and _.')
    .default('pid'),
});
export type SessionLinkCreateInput = z.input<typeof sessionLinkCreateSchema>;

/** PATCH a link: open, pause or close it (closing is final). */
export const sessionLinkStatusSchema = z.strictObject({
  status: z.enum(['open', 'paused', 'closed'], { error: 'Set the status to open, paused or closed.' }),
});

/**
 * One step a participant takes on the session page. The participant id is repeated in every
 * request and must be the one the session cookie belongs to. An answer names the item it answers,
 * so a replay, a second tab or a stale page is recognised instead of answering the wrong item.
 */
export const pageActionSchema = z.discriminatedUnion(
  'action',
  [
    z.strictObject({ action: z.literal('consent'), participantId: participantIdSchema, agree: z.literal(true, { error: 'Agree to the consent text to take part.' }) }),
    z.strictObject({ action: z.literal('begin'), participantId: participantIdSchema }),
    z.strictObject({
      action: z.literal('answer'),
      participantId: participantIdSchema,
      itemId: stage2AnswerSchema.shape.itemId,
      chosen: stage2AnswerSchema.shape.chosen,
      responseTimeMs: stage2AnswerSchema.shape.responseTimeMs,
      sideShown: stage2AnswerSchema.shape.sideShown,
    }),
    // real rewards: where the reward link goes, once the session is complete
    z.strictObject({ action: z.literal('payment-details'), participantId: participantIdSchema, email: paymentDetailsSchema.shape.email }),
  ],
  { error: "Say what the step is: action 'consent', 'begin', 'answer' or 'payment-details'." },
);
export type PageAction = z.infer<typeof pageActionSchema>;

/** What a preview run has answered so far (kept in the team member's browser, never stored). */
export const previewStateSchema = z.strictObject({
  consented: z.boolean().default(false),
  begun: z.boolean().default(false),
  calibration: z.record(z.string().max(64), z.enum(['sooner', 'later'])).default({}),
  stage2: z.record(z.string().max(64), z.enum(['sooner', 'later'])).default({}),
});
export type PreviewState = z.input<typeof previewStateSchema>;
