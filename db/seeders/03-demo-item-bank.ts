import type { Sequelize, Transaction } from 'sequelize';
import { contentHash } from '../../lib/shared/canonical-json';
import { serveParticipant } from '../../lib/design';
import { bankFor } from '../../lib/shared/item-bank-plan';
import { DesignVersion, Membership, Participant, Study, User } from '../models';
import { demoAccounts } from './demo-accounts.mjs';
import { DEMO_STUDY_NAME } from './01-demo-team';

/** Fictional Harbourlight participants (rates per day) whose calibration answers were collected offline. */
const DEMO_PARTICIPANTS = [
  { participantId: 'HL-0001', kSmall: 0.06, kLarge: 0.012 },
  { participantId: 'HL-0002', kSmall: 0.03, kLarge: 0.006 },
  { participantId: 'HL-0003', kSmall: 0.09, kLarge: 0.02 },
];

/**
 * Demo participants served from the demo study's personalised frozen version, as a batch upload
 * by the operator would: noiseless hyperbolic answers of three fictional participants. Safe to
 * run again: participants already present are skipped.
 */
export async function seed(sequelize: Sequelize): Promise<void> {
  const operator = await User.findOne({ where: { email: demoAccounts.find((a) => a.role === 'operator')!.email } });
  if (!operator) return;
  const membership = await Membership.findOne({ where: { userId: operator.id }, include: [{ model: Study, as: 'study', where: { name: DEMO_STUDY_NAME } }] });
  if (!membership) return;
  const versions = await DesignVersion.findAll({ where: { studyId: membership.studyId }, order: [['id', 'ASC']] });
  const version = versions.find((v) => v.content.spec.mode === 'personalised');
  if (!version) return;
  const { bank, locate } = bankFor(version);
  await sequelize.transaction(async (transaction) => {
    for (const person of DEMO_PARTICIPANTS) {
      if (await Participant.findOne({ where: { studyId: version.studyId, participantId: person.participantId }, transaction })) continue;
      const responses: Record<string, string> = {};
      for (const item of bank.items.filter((i) => i.role === 'calibration')) {
        const k = item.magnitude === 'small' ? person.kSmall : person.kLarge;
        responses[item.id] = item.laterAmount / (1 + k * item.laterDelay) > item.soonerAmount ? 'later' : 'sooner';
      }
      responses['check-calibration'] = 'sooner';
      const served = serveParticipant(version.content, bank, { participantId: person.participantId, responses, locate });
      await recordBatchParticipant({ version, participantId: person.participantId, responses, served, servedBy: operator.id, servedAt: new Date(), transaction });
    }
  });
}

/**
 * Stores a demo participant served from calibration answers uploaded as a batch by an operator,
 * as the batch upload stores one (the item-bank and results demos both use it).
 */
export function recordBatchParticipant(row: {
  version: DesignVersion;
  participantId: string;
  responses: Record<string, string>;
  served: ReturnType<typeof serveParticipant>;
  servedBy: number;
  servedAt: Date;
  transaction: Transaction;
}): Promise<Participant> {
  const { version, participantId, responses, served, servedAt, transaction } = row;
  return Participant.create(
    {
      studyId: version.studyId,
      designVersionId: version.id,
      participantId,
      responsesHash: contentHash(responses),
      responses,
      result: { ...served, designHash: version.hash, servedAt: servedAt.toISOString() },
      flag: served.flag,
      source: 'batch',
      apiKeyId: null,
      servedBy: row.servedBy,
      createdAt: servedAt,
    },
    { transaction },
  );
}
