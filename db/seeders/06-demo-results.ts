import type { Sequelize } from 'sequelize';
import { analyseStudy, ANALYSIS_ENGINE_VERSION, choiceProbability, designChoiceModel, createRandom, discountFactor, priorPoints, resultsParagraph, serveParticipant, type BankItem, type ParticipantData } from '../../lib/design';
import { bankFor } from '../../lib/shared/item-bank-plan';
import { participantData, type StoredAnswer } from '../../lib/shared/results/participant-data';
import { storeAnalysis } from '../../lib/shared/results/stored-analysis';
import { DEFAULT_EXCLUSIONS } from '../../lib/shared/validations/analysis';
import type { FrozenDesign } from '../../lib/shared/validations/planner';
import packageJson from '../../package.json';
import { Analysis, DesignVersion, Membership, ParticipantSession, Stage2Answer, Study, User } from '../models';
import { demoAccounts } from './demo-accounts.mjs';
import { DEMO_STUDY_NAME } from './01-demo-team';
import { recordBatchParticipant } from './03-demo-item-bank';

// An invented completed dataset for the fictional Harbourlight Decision Lab: 36 participants
// whose choices follow a hyperboloid with delay sensitivity 0.7 (the design assumed the
// hyperbolic model), γ = 15 and a 3 % lapse, so the results page has reversals to show and
// some probes that miss the zone. Two fail the attention check; one stops half-way.
const COUNT = 36;
const TRUTH = { model: { id: 'hyperboloid' as const, sensitivity: 0.7 }, gamma: 15, lapse: 0.03 };
const ANALYSIS_NAME = 'Main analysis';

/**
 * Demo results: participants HL-R001… served from the demo study's personalised frozen version,
 * their stage-2 answers as an upload by the operator would record them, session rows, and one
 * saved analysis. Idempotent: nothing is written when the analysis already exists.
 */
export async function seed(sequelize: Sequelize): Promise<void> {
  const operator = await User.findOne({ where: { email: demoAccounts.find((a) => a.role === 'operator')!.email } });
  const editor = await User.findOne({ where: { email: demoAccounts.find((a) => a.role === 'editor')!.email } });
  if (!operator || !editor) return;
  const membership = await Membership.findOne({ where: { userId: operator.id }, include: [{ model: Study, as: 'study', where: { name: DEMO_STUDY_NAME } }] });
  if (!membership) return;
  const versions = await DesignVersion.findAll({ where: { studyId: membership.studyId }, order: [['id', 'ASC']] });
  const version = versions.find((v) => json<FrozenDesign>(v.content).spec.mode === 'personalised');
  if (!version) return;
  if (await Analysis.findOne({ where: { studyId: version.studyId, name: ANALYSIS_NAME } })) return;
  const content = json<FrozenDesign>(version.content);
  const { bank, locate } = bankFor({ hash: version.hash, content });
  const random = createRandom({ seed: 20261203 });
  const rates = priorPoints(content.prior, { method: 'monte-carlo', count: COUNT, random });
  const choose = (kSooner: number, kLater: number, item: BankItem) => {
    const gap = discountFactor(TRUTH.model, kLater, item.laterDelay) - (item.soonerAmount / item.laterAmount) * discountFactor(TRUTH.model, kSooner, item.soonerDelay);
    return random.uniform() < choiceProbability({ sensitivity: TRUTH.gamma, lapse: TRUTH.lapse }, gap);
  };
  const rt = () => Math.round(2400 * Math.exp(0.45 * random.normal()));
  const data: ParticipantData[] = [];
  await sequelize.transaction(async (transaction) => {
    for (let i = 0; i < COUNT; i++) {
      const participantId = `HL-R${String(i + 1).padStart(3, '0')}`;
      const kSmall = rates.kSmall[i];
      const kLarge = rates.kLarge[i];
      const responses: Record<string, string> = {};
      for (const item of bank.items.filter((x) => x.role === 'calibration')) {
        const k = item.magnitude === 'small' ? kSmall : kLarge;
        responses[item.id] = choose(k, k, item) ? 'later' : 'sooner';
      }
      responses['check-calibration'] = i === 7 || i === 23 ? 'later' : 'sooner';
      const served = serveParticipant(content, bank, { participantId, responses, locate });
      const servedAt = new Date(Date.UTC(2026, 10, 2, 9, 0) + i * 37 * 60_000);
      const row = await recordBatchParticipant({ version, participantId, responses, served, servedBy: operator.id, servedAt, transaction });
      const answered = i === 30 ? served.items.slice(0, Math.floor(served.items.length / 2)) : served.items;
      const answers = new Map<string, StoredAnswer>();
      for (const item of answered) {
        const later = item.view === null ? false : choose(kSmall, kLarge, item);
        answers.set(item.id, { chosen: later ? 'LL' : 'SS', responseMs: rt() });
      }
      await Stage2Answer.bulkCreate(
        [...answers].map(([itemId, a]) => ({ studyId: version.studyId, participantRef: row.id, itemId, chosen: a.chosen as 'SS' | 'LL', responseMs: a.responseMs, sideShown: null, source: 'upload' as const, apiKeyId: null, recordedBy: operator.id, createdAt: servedAt })),
        { transaction },
      );
      const complete = answered.length === served.items.length;
      await ParticipantSession.create(
        {
          studyId: version.studyId,
          designVersionId: version.id,
          participantId,
          status: complete ? 'completed' : 'served',
          source: 'upload',
          apiKeyId: null,
          calibrationAnswers: null,
          startedAt: servedAt,
          calibratedAt: servedAt,
          servedAt,
          completedAt: complete ? servedAt : null,
          lastActivityAt: servedAt,
        },
        { transaction },
      );
      data.push(participantData({ participantId, calibrationItems: bank.items, responses, served, answers }));
    }
    const settings = { exclusions: DEFAULT_EXCLUSIONS, alternative: 'greater' as const, alpha: 0.05, zoneModel: 'bic' as const };
    const analysis = analyseStudy(data, { model: content.spec.model, choice: designChoiceModel(content.spec), ...settings });
    const software = `Switchback ${packageJson.version} (analysis engine ${ANALYSIS_ENGINE_VERSION})`;
    const paragraph = resultsParagraph(analysis, { designLabel: `${content.spec.name}, frozen version ${version.number}`, designHash: version.hash, analysisLabel: `${ANALYSIS_NAME}, version 1`, software });
    await Analysis.create(
      { studyId: version.studyId, designVersionId: version.id, name: ANALYSIS_NAME, version: 1, designHash: version.hash, engineVersion: ANALYSIS_ENGINE_VERSION, settings, result: storeAnalysis(analysis), paragraph, createdBy: editor.id },
      { transaction },
    );
  });
}

function json<T>(value: unknown): T {
  return (typeof value === 'string' ? JSON.parse(value) : value) as T;
}
