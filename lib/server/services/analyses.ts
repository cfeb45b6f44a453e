import { UniqueConstraintError } from 'sequelize';
import { db } from '@/db';
import { Analysis, User } from '@/db/models';
import { ConflictError, NotFoundError, ValidationError } from '@/lib/server/errors';
import { figurePng } from '@/lib/server/figures/png';
import { analyseStudy, ANALYSIS_ENGINE_VERSION, designChoiceModel, DesignInputError, participantsToAnalyse, resultsParagraph, type ModelId, type ParticipantData, type ParticipantRefit, type RefitOptions } from '@/lib/design';
import { queueEnv } from '@/lib/server/env';
import { queueWorkerCount } from '@/lib/server/jobs/chunk-queue';
import { runRefitsOnQueue } from '@/lib/server/jobs/analysis/queue';
import { personRecordsCsv } from '@/lib/shared/csv';
import { patternsSvg, zonesSvg } from '@/lib/shared/figures/results-figures';
import { storeAnalysis, type StoredAnalysis } from '@/lib/shared/results/stored-analysis';
import type { AnalysisCreate } from '@/lib/shared/validations/analysis';
import type { FrozenDesign } from '@/lib/shared/validations/planner';
import packageJson from '@/package.json';
import { recordAudit } from './audit';
import { loadVersion } from './item-bank';
import { loadStudyData } from './observed-choices';
import { parseEntityId } from '@/lib/server/route-ids';

/** "Switchback 0.1.0 (analysis engine 1)": the software every saved analysis cites. */
export const ANALYSIS_SOFTWARE = `Switchback ${packageJson.version} (analysis engine ${ANALYSIS_ENGINE_VERSION})`;

export type AnalysisDto = {
  id: number;
  name: string;
  version: number;
  label: string;
  designVersion: { id: number; number: number; hash: string; name: string };
  engineVersion: string;
  software: string;
  settings: Omit<AnalysisCreate, 'name' | 'designVersionId'>;
  createdBy: string | null;
  createdAt: string;
  result?: StoredAnalysis;
  paragraph?: string;
};

function json<T>(value: unknown): T {
  return (typeof value === 'string' ? JSON.parse(value) : value) as T;
}

/**
 * With REDIS_URL and at least one `npm run worker` listening, the participants' refits (the bulk
 * of an analysis) go to the shared queue; otherwise, or when the queue refuses (a bad setting is
 * then refused by analyseStudy itself, naming the field), undefined: analyseStudy refits here.
 */
async function refitsOnQueue(data: ParticipantData[], models: Pick<RefitOptions, 'model' | 'choice'>, exclusions: AnalysisCreate['exclusions']): Promise<ParticipantRefit[] | undefined> {
  if (queueEnv().redisUrl === null || (await queueWorkerCount('analysis')) === 0) return undefined;
  try {
    // confidence 0.95: analyseStudy's own, so the refits are the ones it would compute
    return await runRefitsOnQueue(participantsToAnalyse(data, exclusions), { ...models, confidence: 0.95, label: 'analysis' });
  } catch (error) {
    console.warn(`[switchback] refits on the queue failed, refitting in this process: ${error instanceof Error ? error.message : error}`);
    return undefined;
  }
}

/**
 * Runs and saves an analysis: the rules are stated in the request before any result exists,
 * the analysis is computed from every participant served with the frozen version (analyseStudy
 * in the core) and stored with its name, the next version number for that name, the design's
 * hash and the engine version. Saved analyses never change; a rerun is a new version.
 *
 * @throws ValidationError when the version has no participants with stage-2 answers, or the core refuses a setting
 */
export async function createAnalysis(actorId: number, studyId: number, input: AnalysisCreate): Promise<AnalysisDto> {
  const version = await loadVersion(studyId, input.designVersionId);
  const content = json<FrozenDesign>(version.content);
  const data = await loadStudyData(studyId, { id: version.id, hash: version.hash, content });
  if (!data.some((p) => p.pairs.some((q) => q.far.choice !== null && q.near.choice !== null))) {
    throw new ValidationError([{ path: 'designVersionId', message: 'No participant of this version has answered a question pair yet: upload or collect stage-2 answers first.' }], 'Nothing to analyse yet.');
  }
  const settings = { exclusions: input.exclusions, alternative: input.alternative, alpha: input.alpha, zoneModel: input.zoneModel };
  let analysis;
  try {
    // The frozen design's own γ, the one the probe-items API served estimates with: the refit holds it fixed.
    const models = { model: content.spec.model, choice: designChoiceModel(content.spec) };
    const refits = await refitsOnQueue(data, models, input.exclusions);
    analysis = analyseStudy(data, { ...models, refits, exclusions: input.exclusions, alternative: input.alternative, alpha: input.alpha, zoneModel: input.zoneModel as ModelId | 'aic' | 'bic' });
  } catch (error) {
    if (error instanceof DesignInputError) throw new ValidationError([{ path: error.field, message: error.message }], 'The analysis cannot be run with these settings.');
    throw error;
  }
  if (analysis.participantsAnalysed === 0) throw new ValidationError([{ path: 'exclusions', message: 'The exclusion rules leave no participant to analyse.' }], 'Nothing left to analyse.');
  const stored = storeAnalysis(analysis);
  try {
    const row = await db().transaction(async (transaction) => {
      const latest = (await Analysis.max('version', { where: { studyId, name: input.name }, transaction })) as number | null;
      const number = (latest ?? 0) + 1;
      const label = `${input.name}, version ${number}`;
      const paragraph = resultsParagraph(analysis, { designLabel: `${content.spec.name}, frozen version ${version.number}`, designHash: version.hash, analysisLabel: label, software: ANALYSIS_SOFTWARE });
      const created = await Analysis.create(
        { studyId, designVersionId: version.id, name: input.name, version: number, designHash: version.hash, engineVersion: ANALYSIS_ENGINE_VERSION, settings, result: stored, paragraph, createdBy: actorId },
        { transaction },
      );
      await recordAudit({ actorId, studyId, action: 'analysis.create', details: { analysisId: created.id, name: input.name, version: number, designVersionId: version.id, hash: version.hash, participants: analysis.participantsAnalysed } }, transaction);
      return created;
    });
    return getAnalysis(studyId, row.id);
  } catch (error) {
    if (error instanceof UniqueConstraintError) throw new ConflictError('Someone saved a version of this analysis at the same moment; save again to make the next version.');
    throw error;
  }
}

async function toDto(row: Analysis, withResult: boolean): Promise<AnalysisDto> {
  const version = await loadVersion(row.studyId, row.designVersionId);
  const content = json<FrozenDesign>(version.content);
  const creator = row.createdBy ? await User.findByPk(row.createdBy, { attributes: ['name'] }) : null;
  return {
    id: row.id,
    name: row.name,
    version: row.version,
    label: `${row.name}, version ${row.version}`,
    designVersion: { id: version.id, number: version.number, hash: row.designHash, name: content.spec.name },
    engineVersion: row.engineVersion,
    software: `Switchback ${packageJson.version} (analysis engine ${row.engineVersion})`,
    settings: json(row.settings),
    createdBy: creator?.name ?? null,
    createdAt: row.createdAt.toISOString(),
    ...(withResult ? { result: json<StoredAnalysis>(row.result), paragraph: row.paragraph } : {}),
  };
}

/** The study's saved analyses, newest first, without their results. */
export async function listAnalyses(studyId: number): Promise<AnalysisDto[]> {
  db();
  const rows = await Analysis.findAll({ where: { studyId }, attributes: { exclude: ['result'] }, order: [['createdAt', 'DESC'], ['id', 'DESC']] });
  return Promise.all(rows.map((r) => toDto(r, false)));
}

/** One saved analysis with its result and paragraph; 404 for another study's or a missing one. */
export async function getAnalysis(studyId: number, analysisId: number): Promise<AnalysisDto> {
  db();
  const row = await Analysis.findOne({ where: { id: analysisId, studyId } });
  if (!row) throw new NotFoundError('Analysis not found.');
  return toDto(row, true);
}

/** An analysis id from a route segment; anything else is a missing analysis. */
export function parseAnalysisId(raw: string): number {
  return parseEntityId(raw, 'Analysis');
}

export const ANALYSIS_EXPORTS = ['csv', 'json', 'patterns.svg', 'patterns.png', 'zones.svg', 'zones.png'] as const;
export type AnalysisExport = (typeof ANALYSIS_EXPORTS)[number];

const CAUTION = 'Estimates from hypothetical choices, not a clinical assessment of any person.';

/** The two figures of an analysis as SVG text (the page shows the same text). */
export function analysisFigures(a: AnalysisDto & { result: StoredAnalysis }) {
  const alternative = a.result.comparison.bestByBic && a.result.comparison.bestByBic !== a.result.options.model.id ? a.result.comparison.bestByBic : a.result.options.model.id === 'hyperbolic' ? 'exponential' : 'hyperbolic';
  const caption = `${a.label} · design ${a.designVersion.hash.slice(0, 12)} · N = ${a.result.participantsAnalysed} · ${CAUTION}`;
  return {
    patterns: patternsSvg(a.result.patterns, { alternative, caption }),
    zones: a.result.zones ? zonesSvg(a.result.zones, { caption }) : null,
  };
}

/** Per participant and model: estimates with intervals, fit, prediction and the zone diagnosis, through the formula guard, with the analysis it came from and the caution as columns. */
export function analysisCsv(a: AnalysisDto & { result: StoredAnalysis }): string {
  const zones = new Map((a.result.zones?.participants ?? []).map((z) => [z.participantId, z]));
  const rows = a.result.participants.flatMap((p) =>
    p.fits.map((f) => {
      const z = zones.get(p.participantId);
      const diagnosed = a.result.zones?.model === f.model ? z : undefined;
      return {
        participant: p.participantId,
        model: f.model,
        kSmall: f.kSmall.value,
        kSmallLower: f.kSmall.interval?.lower ?? '',
        kSmallUpper: f.kSmall.interval?.upper ?? '',
        kLarge: f.kLarge.value,
        kLargeLower: f.kLarge.interval?.lower ?? '',
        kLargeUpper: f.kLarge.interval?.upper ?? '',
        shapeName: f.shape?.name ?? '',
        shape: f.shape?.value ?? '',
        shapeLower: f.shape?.interval?.lower ?? '',
        shapeUpper: f.shape?.interval?.upper ?? '',
        logLikelihood: f.logLikelihood,
        parameters: f.parameterCount,
        choices: f.choiceCount,
        aic: f.aic,
        bic: f.bic,
        predictiveLogScore: f.predictiveLogScore,
        predictedChoices: f.predictedChoices,
        converged: f.converged,
        zoneLower: diagnosed?.zone?.lower ?? '',
        zoneUpper: diagnosed?.zone?.upper ?? '',
        probesBefore: diagnosed?.counts.before ?? '',
        probesInside: diagnosed?.counts.inside ?? '',
        probesAfter: diagnosed?.counts.after ?? '',
      };
    }),
  );
  // A plain table (no comment lines, which break spreadsheet and survey imports): where each row
  // comes from rides along as columns, and the caution is the last column of every row.
  const provenance = { analysis: a.label, designVersion: a.designVersion.number, designHash: a.designVersion.hash, software: a.software };
  return personRecordsCsv({ records: rows.map((row) => ({ ...row, ...provenance })) });
}

/** A download of a saved analysis: CSV, JSON, or either figure as SVG or PNG (300 dpi). */
export async function exportAnalysis(studyId: number, analysisId: number, format: AnalysisExport) {
  const a = (await getAnalysis(studyId, analysisId)) as AnalysisDto & { result: StoredAnalysis };
  const base = `analysis-${a.id}-${a.name.toLowerCase().replace(/[^a-z0-9]+/g, '-').replace(/^-|-$/g, '').slice(0, 40) || 'results'}-v${a.version}`;
  if (format === 'csv') return { body: analysisCsv(a), type: 'text/csv; charset=utf-8', file: `${base}.csv` };
  if (format === 'json') return { body: JSON.stringify({ ...a, caution: CAUTION }, null, 2), type: 'application/json', file: `${base}.json` };
  const figures = analysisFigures(a);
  const [name, kind] = format.split('.') as ['patterns' | 'zones', 'svg' | 'png'];
  const svg = figures[name];
  if (svg === null) throw new NotFoundError('This analysis has no zone diagnosis to draw.');
  if (kind === 'svg') return { body: svg, type: 'image/svg+xml', file: `${base}-${name}.svg` };
  return { body: figurePng(svg), type: 'image/png', file: `${base}-${name}.png` };
}
