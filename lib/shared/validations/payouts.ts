import { z } from 'zod';
import '@/lib/shared/validations/error-map';
import { participantIdSchema } from '@/lib/shared/validations/item-bank';

// Real rewards: the settings of a frozen version, the ledger's filters, owners' approvals and
// cancellations, and a participant's payment details. Amounts cross the API in major units (a
// number like 25 or 37.5); the server turns them into whole minor units exactly (toMinorUnits)
// and refuses anything finer than the currency's minor unit.

const LARGEST_AMOUNT = 1_000_000;
const amount = (label: string) =>
  z
    .number({ error: `Give the ${label} as an amount in the study's currency, or null for none.` })
    .positive(`The ${label} must be more than 0.`)
    .max(LARGEST_AMOUNT, `The ${label} must be at most ${LARGEST_AMOUNT.toLocaleString('en')}.`)
    .nullable();

/** PUT /api/studies/{id}/rewards/{versionId}: real rewards on or off, which blocks the paid choice is drawn from, the cap and the approval threshold. */
export const rewardSettingsSchema = z.strictObject({
  enabled: z.boolean({ error: 'Say whether real rewards are on (true) or off (false).' }),
  blocks: z.enum(['both', 'calibration', 'probe'], { error: 'Draw from both blocks, the calibration block or the probe block.' }).default('both'),
  cap: amount('per-participant cap'),
  approvalThreshold: amount('approval threshold'),
});
export type RewardSettingsInput = z.infer<typeof rewardSettingsSchema>;

export const PAYOUT_STATUS_FILTERS = ['scheduled', 'held', 'sending', 'sent', 'failed', 'cancelled'] as const;
const day = (label: string) => z.string().regex(/^\d{4}-\d{2}-\d{2}$/, `Give the ${label} as YYYY-MM-DD.`).optional();

/** GET /api/studies/{id}/payouts: filters (status, participant id contains, due between) and the format. */
export const payoutsQuerySchema = z.strictObject({
  status: z.enum(PAYOUT_STATUS_FILTERS, { error: 'Filter by scheduled, held, sending, sent, failed or cancelled.' }).optional(),
  participant: z.string().max(128, 'Participant ids are at most 128 characters.').optional(),
  dueFrom: day('first due date'),
  dueTo: day('last due date'),
  format: z.enum(['json', 'csv'], { error: 'Ask for json or csv.' }).default('json'),
});
export type PayoutsQuery = z.infer<typeof payoutsQuerySchema>;

const payoutIds = z
  .array(z.number({ error: 'Payout ids are whole numbers.' }).int('Payout ids are whole numbers.').min(1, 'Payout ids are 1 or more.').max(4_294_967_295, 'No payout has that id.'), { error: 'List the payouts by id.' })
  .min(1, 'Choose at least one payout.')
  .max(500, 'At most 500 payouts at once.');

/** POST /api/studies/{id}/payouts/approve: owners approve a batch of payouts above the threshold. */
export const approvePayoutsSchema = z.strictObject({ ids: payoutIds });

/** POST /api/studies/{id}/payouts/cancel: owners cancel payouts not yet sent, with the reason recorded. */
export const cancelPayoutsSchema = z.strictObject({
  ids: payoutIds,
  reason: z.string({ error: 'Say why the payouts are cancelled.' }).trim().min(3, 'Say why the payouts are cancelled (at least 3 characters).').max(300, 'The reason is at most 300 characters.'),
});

/** POST /api/v1/studies/{id}/payment-details: where a participant's reward link goes (nothing more is kept). */
export const paymentDetailsSchema = z.strictObject({
  participantId: participantIdSchema,
  email: z.email({ error: 'Give an e-mail address the reward link can be sent to.' }).max(254, 'E-mail addresses are at most 254 characters.'),
});
