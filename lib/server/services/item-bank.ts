import { Design, DesignVersion } from '@/db/models';
import { db } from '@/db';
import { NotFoundError, ValidationError } from '@/lib/server/errors';
import { recordsToCsv } from '@/lib/shared/csv';
import { CHOICE_SENSITIVITY_UNIT, DesignInputError, describeCalibration, designChoiceModel, type BankItem } from '@/lib/design';
import type { Study } from '@/db/models';
import { exportOptionsSchema, type ExportOptions } from '@/lib/shared/validations/item-bank';
import type { FrozenDesign } from '@/lib/shared/validations/planner';
import { extrapolationRisk, type ExtrapolationRisk } from '@/lib/shared/power-scenario';
import { recordAudit } from './audit';
import { bankFor, defaultSeed } from '@/lib/shared/item-bank-plan';
import { itemBankId, presentationOf } from './item-bank-id';

/** Column order of the CSV export; the JSON export's items have exactly these fields. */
export const ITEM_COLUMNS: ReadonlyArray<keyof BankItem> = [
  'id', 'block', 'role', 'set', 'view', 'pairId', 'magnitude', 'soonerAmount', 'soonerDelay', 'laterAmount', 'laterDelay', 'soonerSide', 'position', 'text',
];

/** The study's frozen design versions, newest first, with what the item-bank page shows. */
export async function listFrozenVersions(studyId: number) {
  db();
  const rows = await DesignVersion.findAll({ where: { studyId }, include: [{ model: Design, as: 'design', attributes: ['name'] }], order: [['createdAt', 'DESC'], ['id', 'DESC']] });
  return rows.map((v) => ({
    id: v.id,
    number: v.number,
    hash: v.hash,
    designName: (v as unknown as { design?: Design }).design?.name ?? v.content.spec.name,
    mode: v.content.spec.mode,
    currency: v.content.spec.currency,
    frozenAt: v.createdAt.toISOString(),
  }));
}

/** A frozen version of this study; 404 for another study's or a missing one. */
export async function loadVersion(studyId: number, rawVersionId: string | number): Promise<DesignVersion> {
  const id = Number(rawVersionId);
  if (!Number.isSafeInteger(id) || id <= 0) throw new NotFoundError('Design version not found.');
  db();
  const version = await DesignVersion.findOne({ where: { id, studyId } });
  if (!version) throw new NotFoundError('Design version not found.');
  return version;
}

/** The bank for a version, with a design that cannot be built answered as 422 naming the field. */
export function bankOrInvalid(version: { hash: string; content: FrozenDesign }, options: Partial<ExportOptions> = {}) {
  try {
    return bankFor(version, options);
  } catch (error) {
    if (error instanceof DesignInputError) throw new ValidationError([{ path: error.field, message: error.message }], 'This design cannot be turned into an item bank.');
    throw error;
  }
}

const risks = new Map<string, ExtrapolationRisk | null>();

/** The simulated extrapolation risk of a version, computed once per process (frozen content never changes). */
function riskFor(version: DesignVersion): ExtrapolationRisk | null {
  if (!risks.has(version.hash)) {
    if (risks.size >= 64) risks.delete(risks.keys().next().value!);
    risks.set(version.hash, extrapolationRisk(version.content as FrozenDesign));
  }
  return risks.get(version.hash)!;
}

/** What the item-bank page shows: the items, rounding report, warnings and the file header. */
export function previewItemBank(study: Study, version: DesignVersion, options: ExportOptions) {
  const { bank } = bankOrInvalid(version, options);
  const seed = options.seed ?? defaultSeed(version.hash);
  return {
    header: {
      study: { id: study.id, name: study.name },
      designVersion: { id: version.id, number: version.number, hash: version.hash, name: version.content.spec.name },
      mode: bank.mode,
      seed,
      currency: version.content.spec.currency,
      delayUnit: bank.delayUnit,
      amountUnit: bank.amountUnit,
      minGap: bank.minGap,
      probeGap: bank.probeGap,
      monthDays: 30,
      /** the id an API key bound to the same settings reports; send it with calibration answers so a mismatch is refused */
      itemBankId: itemBankId(version.hash, presentationOf(version.hash, { seed, delayUnit: bank.delayUnit, minGap: bank.minGap })),
      choiceModel: { ...designChoiceModel(version.content.spec), unit: CHOICE_SENSITIVITY_UNIT },
      /** where the calibration delays go and which model stage 1 fits (describeCalibration) */
      calibration: describeCalibration(version.content.spec),
      /** what the probe delays maximise (issue 17: 'model-discrimination' tells the hyperbolic and exponential models apart) */
      probeCriterion: {
        name: version.content.spec.criterion,
        reversalWeight: version.content.spec.criterion === 'model-discrimination' ? (version.content.spec.reversalWeight ?? 0) : null,
      },
    },
    designPoint: bank.designPoint,
    probeRule:
      bank.mode === 'personalised'
        ? 'Probe and anchor pairs are computed per participant by the probe-items API from that person\'s calibration answers. ' +
          'The probe block below is the fallback set, served to participants whose answers are flagged (all sooner, all later, or inconsistent) ' +
          'or whose estimates have no reversal zone within the limits.'
        : null,
    items: bank.items,
    /** adaptive calibration (issue 17): the stop rule and every candidate the next-item step may ask; null for the fixed block alone */
    adaptiveCalibration: bank.adaptive
      ? {
          rule:
            `Calibration is adaptive (adaptive design optimisation): the session API's next-item step (POST /api/v1/studies/{id}/calibration-next) asks each participant ` +
            `up to ${bank.adaptive.maxItems} of these ${bank.adaptive.candidates.length} candidates, one at a time, each the one with the largest expected information about their rates, ` +
            `stopping early once the posterior SD of ln k and ln K is at most ${bank.adaptive.targetSd}.`,
          maxItems: bank.adaptive.maxItems,
          targetSd: bank.adaptive.targetSd,
          candidateCount: bank.adaptive.candidates.length,
          candidates: bank.adaptive.candidates,
        }
      : null,
    rounding: bank.rounding,
    extrapolation: bank.extrapolation,
    extrapolationRisk: riskFor(version),
    notes: bank.notes,
  };
}

/** What each CSV column holds, for the metadata sidecar. */
export const ITEM_COLUMN_MEANINGS: Record<(typeof ITEM_COLUMNS)[number], string> = {
  id: 'item id, unique in the bank (the probe-items API and stage-2 answers use it)',
  block: 'calibration (stage 1) or probe (stage 2)',
  role: 'calibration, attention-check, late-anchor, reversal-probe or soon-anchor',
  set: 'shared (everyone), personal, or fallback (served when a participant’s estimates cannot place a personal block); candidate: an item adaptive calibration may ask (annotated CSV of an adaptive design)',
  view: 'far or near view of a question pair (empty for calibration items and attention checks)',
  pairId: 'the pair a far and a near view belong to',
  magnitude: 'small or large reward, for calibration items (empty for pairs and checks)',
  soonerAmount: 'smaller-sooner amount, in the currency',
  soonerDelay: 'delay of the smaller-sooner amount, in the delay unit',
  laterAmount: 'larger-later amount, in the currency',
  laterDelay: 'delay of the larger-later amount, in the delay unit',
  soonerSide: 'left or right: the side the smaller-sooner option is shown on',
  position: '1-based presentation order within the block',
  text: 'the question as worded for participants',
};

/** A file name with the study, the version's hash (12 hex digits) and the seed. */
export function exportFileName(study: { id: number; name: string }, hash: string, seed: number, extension: 'csv' | 'json' | 'meta.json') {
  const slug = study.name.toLowerCase().replace(/[^a-z0-9]+/g, '-').replace(/^-|-$/g, '').slice(0, 40) || 'study';
  return `switchback-items-${study.id}-${slug}-${hash.slice(0, 12)}-seed${seed}.${extension}`;
}

/**
 * Items as CSV, one row per item, formula-safe. Without header lines it is a plain CSV (header
 * row first); with them, each comes first as a "#" comment line (study, design hash, seed, units).
 */
export function itemsCsv(items: ReadonlyArray<Omit<BankItem, 'set'> & { set: string }>, headerLines: string[] = []): string {
  return recordsToCsv({ records: items, columns: ITEM_COLUMNS, comments: headerLines });
}

/**
 * An export of the item bank as CSV or JSON, recorded in the audit trail (in one transaction
 * with nothing else to write, the audit event is the record of the download).
 */
export async function exportItemBank(actorId: number, study: Study, version: DesignVersion, options: ExportOptions) {
  const preview = previewItemBank(study, version, options);
  const { seed } = preview.header;
  const csvName = exportFileName(study, version.hash, seed, 'csv');
  let filename: string;
  let body: string;
  if (options.format === 'csv') {
    filename = csvName;
    body = itemsCsv(preview.items);
  } else if (options.format === 'csv-annotated') {
    filename = csvName;
    const adaptive = preview.adaptiveCalibration;
    body = itemsCsv(adaptive ? [...preview.items, ...adaptive.candidates.map((c) => Object.assign({}, c, { set: 'candidate' }))] : preview.items, [
      `Switchback item bank · study ${study.id} "${study.name}"`,
      `design version ${version.number} · hash ${version.hash} · seed ${seed} · item bank ${preview.header.itemBankId} (gap ${options.minGap})`,
      `choice model: logistic, sensitivity γ = ${preview.header.choiceModel.sensitivity} ${CHOICE_SENSITIVITY_UNIT}, no lapse (rate estimates use it)`,
      `calibration: ${preview.header.calibration}`,
      `mode ${preview.header.mode} · currency ${preview.header.currency} · amounts rounded to ${preview.header.amountUnit} · delays in whole ${preview.header.delayUnit} (a month is 30 days)`,
      preview.probeRule ?? 'Population design: every participant runs these items.',
      ...(adaptive ? [`${adaptive.rule} The candidates are the last ${adaptive.candidateCount} rows (set "candidate"); the fixed calibration block stays for software that cannot call the step.`] : []),
    ]);
  } else if (options.format === 'metadata') {
    filename = exportFileName(study, version.hash, seed, 'meta.json');
    const { items, adaptiveCalibration, ...rest } = preview;
    const adaptive = adaptiveCalibration ? { rule: adaptiveCalibration.rule, maxItems: adaptiveCalibration.maxItems, targetSd: adaptiveCalibration.targetSd, candidateCount: adaptiveCalibration.candidateCount } : null;
    body = `${JSON.stringify({ describes: csvName, itemCount: items.length, columns: ITEM_COLUMN_MEANINGS, ...rest, adaptiveCalibration: adaptive }, null, 2)}\n`;
  } else {
    filename = exportFileName(study, version.hash, seed, 'json');
    body = `${JSON.stringify(preview, null, 2)}\n`;
  }
  await db().transaction(async (transaction) => {
    await recordAudit(
      { actorId, studyId: study.id, action: 'item-bank.export', details: { designVersionId: version.id, hash: version.hash, seed, format: options.format, delayUnit: options.delayUnit, minGap: options.minGap } },
      transaction,
    );
  });
  return { filename, body, contentType: options.format.startsWith('csv') ? 'text/csv; charset=utf-8' : 'application/json; charset=utf-8' };
}

/** Export options from a request's query string; unknown or bad parameters → 422 naming them. */
export function readExportOptions(request: Request): ExportOptions {
  const query = Object.fromEntries(new URL(request.url).searchParams);
  const parsed = exportOptionsSchema.safeParse(query);
  if (!parsed.success) throw new ValidationError(parsed.error.issues.map((i) => ({ path: i.path.map(String).join('.') || '(query)', message: i.message })));
  return parsed.data;
}

/** What the probe-items API needs of a frozen version, as a plain object. */
export type FrozenVersionRef = { id: number; studyId: number; hash: string; content: FrozenDesign };

const versionCache = new Map<number, FrozenVersionRef>();

/** A frozen version by id, cached in this process (frozen content never changes). */
export async function frozenVersionById(id: number): Promise<FrozenVersionRef> {
  const hit = versionCache.get(id);
  if (hit) return hit;
  db();
  const version = await DesignVersion.findByPk(id);
  if (!version) throw new NotFoundError('The design version of this key no longer exists.');
  const ref = { id: version.id, studyId: version.studyId, hash: version.hash, content: version.content };
  if (versionCache.size > 256) versionCache.clear();
  versionCache.set(id, ref);
  return ref;
}
