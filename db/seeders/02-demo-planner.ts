import type { Sequelize } from 'sequelize';
import { contentHash } from '../../lib/shared/canonical-json';
import { designSpecSchema, frozenDesignSchema, priorSetSchema, type DesignSpec } from '../../lib/shared/validations/planner';
import { decodeJson } from '../json';
import { AuditEvent, Design, DesignVersion, Membership, PriorSet, Study, User } from '../models';
import { demoAccounts } from './demo-accounts.mjs';
import { DEMO_STUDY_NAME } from './01-demo-team';

export const DEMO_PRIOR_NAME = 'Harbourlight pilot';
export const DEMO_DESIGN_NAMES = ['Personalised, two-week soon delay', 'Population, expected reversal rate'] as const;

const priorInput = priorSetSchema.parse({
  name: DEMO_PRIOR_NAME,
  medianSmall: 0.02,
  medianLarge: 0.008,
  sdLogSmall: 0.8,
  sdLogLarge: 0.8,
  correlation: 0.6,
  source: 'manual',
  notes: 'Planning values for the fictional Harbourlight savings study; replace them with a fit from the pilot data when it arrives.',
});

function specs(priorSetId: number): DesignSpec[] {
  const common = {
    priorSetId,
    ratio: 0.6,
    largeAmount: 120,
    currency: 'EUR',
    lateDelayLimit: 730,
    probePairs: 4,
    lateAnchors: 2,
    soonAnchors: 2,
    calibration: { itemsPerMagnitude: 10, minDelay: 7, maxDelay: 365 },
    choiceSensitivity: 20,
  };
  return [
    designSpecSchema.parse({ ...common, name: DEMO_DESIGN_NAMES[0], model: { id: 'hyperbolic' }, mode: 'personalised', soonDelay: { mode: 'fixed', days: 14 }, criterion: 'gap-product' }),
    designSpecSchema.parse({ ...common, name: DEMO_DESIGN_NAMES[1], model: { id: 'hyperboloid', sensitivity: 0.8 }, mode: 'population', soonDelay: { mode: 'optimised', min: 7, max: 60 }, criterion: 'expected-reversal-rate' }),
  ];
}

/**
 * The demo study's planner: the prior set "Harbourlight pilot", two candidate designs, and the
 * first design frozen once (with its audit event). Safe to run again: finds before creating.
 */
export async function seed(sequelize: Sequelize): Promise<void> {
  await sequelize.transaction(async (transaction) => {
    const owner = await User.findOne({ where: { email: demoAccounts.find((a) => a.role === 'owner')!.email }, transaction });
    const editor = await User.findOne({ where: { email: demoAccounts.find((a) => a.role === 'editor')!.email }, transaction });
    if (!owner || !editor) return;
    const membership = await Membership.findOne({ where: { userId: owner.id, role: 'owner' }, include: [{ model: Study, as: 'study', where: { name: DEMO_STUDY_NAME } }], transaction });
    if (!membership) return;
    const studyId = membership.studyId;
    const { name, source, notes, ...values } = priorInput;
    const [prior] = await PriorSet.findOrCreate({ where: { studyId, name }, defaults: { studyId, name, source, notes, values, createdBy: editor.id }, transaction });
    const designs: Design[] = [];
    for (const spec of specs(prior.id)) {
      const [design] = await Design.findOrCreate({ where: { studyId, name: spec.name }, defaults: { studyId, name: spec.name, spec, createdBy: editor.id }, transaction });
      designs.push(design);
    }
    const first = designs[0];
    if (await DesignVersion.count({ where: { designId: first.id }, transaction })) return;
    const spec = designSpecSchema.parse(decodeJson(first.spec));
    const priorValues = decodeJson(prior.values);
    const content = frozenDesignSchema.parse({ spec, prior: { ...priorValues, name: prior.name } });
    const hash = contentHash(content);
    const version = await DesignVersion.create({ designId: first.id, studyId, number: 1, hash, content, frozenBy: editor.id }, { transaction });
    await AuditEvent.create({ actorId: editor.id, studyId, action: 'design.freeze', details: { designId: first.id, versionId: version.id, number: 1, hash } }, { transaction });
  });
}
