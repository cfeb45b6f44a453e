import { parseRouteId } from '@/lib/server/route-ids';
import { Design, DesignVersion, PriorSet } from '@/db/models';
import { db } from '@/db';
import { ConflictError, NotFoundError, ValidationError } from '@/lib/server/errors';
import { contentHash } from '@/lib/shared/canonical-json';
import { designSpecSchema, frozenDesignSchema, type DesignSpec, type FrozenDesign } from '@/lib/shared/validations/planner';
import { recordAudit } from './audit';
import { decodeJson } from '@/db/json';


export type VersionSummaryDto = { id: number; number: number; hash: string; createdAt: string; frozenBy: number | null };
export type DesignDto = {
  id: number;
  name: string;
  spec: DesignSpec;
  version: number;
  createdAt: string;
  updatedAt: string;
  /** the latest frozen version, if any */
  latestVersion: VersionSummaryDto | null;
  /** true when the draft is exactly the latest frozen version (same prior values, same spec) */
  frozen: boolean;
};

export function versionSummary(row: DesignVersion): VersionSummaryDto {
  return { id: row.id, number: row.number, hash: row.hash, createdAt: row.createdAt.toISOString(), frozenBy: row.frozenBy };
}

async function priorFor(studyId: number, priorSetId: number) {
  const prior = await PriorSet.findOne({ where: { id: priorSetId, studyId } });
  if (!prior) throw new ValidationError([{ path: 'priorSetId', message: 'Choose a prior set of this study.' }]);
  return prior;
}

/** The frozen content of a draft: its spec with the prior's values copied in. */
export function frozenContent(spec: DesignSpec, prior: PriorSet): FrozenDesign {
  return frozenDesignSchema.parse({ spec, prior: { ...decodeJson(prior.values), name: prior.name } });
}

async function toDto(row: Design, latest: DesignVersion | null, priors: Map<number, PriorSet>): Promise<DesignDto> {
  const spec = decodeJson(row.spec);
  const prior = priors.get(spec.priorSetId);
  const frozen = !!latest && !!prior && latest.hash === contentHash(frozenContent(spec, prior));
  return {
    id: row.id,
    name: row.name,
    spec,
    version: row.version,
    createdAt: row.createdAt.toISOString(),
    updatedAt: row.updatedAt.toISOString(),
    latestVersion: latest ? versionSummary(latest) : null,
    frozen,
  };
}

async function latestVersions(designIds: number[]) {
  const rows = designIds.length ? await DesignVersion.findAll({ where: { designId: designIds }, order: [['number', 'DESC']] }) : [];
  const latest = new Map<number, DesignVersion>();
  for (const v of rows) if (!latest.has(v.designId)) latest.set(v.designId, v);
  return latest;
}

/** The study's candidate designs with their latest frozen version. */
export async function listDesigns(studyId: number): Promise<DesignDto[]> {
  db();
  const rows = await Design.findAll({ where: { studyId }, order: [['name', 'ASC'], ['id', 'ASC']] });
  const priors = new Map((await PriorSet.findAll({ where: { studyId } })).map((p) => [p.id, p]));
  const latest = await latestVersions(rows.map((r) => r.id));
  return Promise.all(rows.map((r) => toDto(r, latest.get(r.id) ?? null, priors)));
}

/** One design of the study; 404 when missing or in another study. */
export async function getDesign(studyId: number, designId: number): Promise<Design> {
  db();
  const row = await Design.findOne({ where: { id: designId, studyId } });
  if (!row) throw new NotFoundError('Design not found.');
  row.spec = decodeJson(row.spec);
  return row;
}

/** A design as JSON, with its latest frozen version. */
export async function designJson(studyId: number, row: Design): Promise<DesignDto> {
  const priors = new Map((await PriorSet.findAll({ where: { studyId } })).map((p) => [p.id, p]));
  const latest = await latestVersions([row.id]);
  return toDto(row, latest.get(row.id) ?? null, priors);
}

/** The design with its prior set's values (what the planner computes from). */
export async function getDesignWithPrior(studyId: number, designId: number) {
  const design = await getDesign(studyId, designId);
  const prior = await priorFor(studyId, design.spec.priorSetId);
  return { design, prior, content: frozenContent(design.spec, prior) };
}

/** Creates a candidate design (a draft). */
export async function createDesign(actorId: number, studyId: number, input: DesignSpec): Promise<Design> {
  const spec = designSpecSchema.parse(input);
  await priorFor(studyId, spec.priorSetId);
  return db().transaction(async (transaction) => {
    const row = await Design.create({ studyId, name: spec.name, spec, createdBy: actorId }, { transaction });
    await recordAudit({ actorId, studyId, action: 'design.create', details: { designId: row.id, name: spec.name } }, transaction);
    return row;
  });
}

/**
 * Saves a draft if the stored version is still `version`; otherwise 409 and nothing is written.
 * Frozen versions are separate rows and never change: editing after a freeze is a new draft.
 */
export async function updateDesign(actorId: number, studyId: number, designId: number, input: DesignSpec, version: number): Promise<Design> {
  const spec = designSpecSchema.parse(input);
  await priorFor(studyId, spec.priorSetId);
  return db().transaction(async (transaction) => {
    const [affected] = await Design.update({ name: spec.name, spec, version: version + 1 }, { where: { id: designId, studyId, version }, transaction });
    if (affected === 0) {
      if (!(await Design.count({ where: { id: designId, studyId }, transaction }))) throw new NotFoundError('Design not found.');
      throw new ConflictError('This design was changed by someone else since you loaded it. Reload to see their version; your changes stay in the form.');
    }
    await recordAudit({ actorId, studyId, action: 'design.update', details: { designId, version: version + 1 } }, transaction);
    const row = (await Design.findByPk(designId, { transaction }))!;
    row.spec = decodeJson(row.spec);
    return row;
  });
}

/** Deletes a draft that was never frozen (frozen versions are cited by exports and power runs: 409). */
export async function deleteDesign(actorId: number, studyId: number, designId: number): Promise<void> {
  await db().transaction(async (transaction) => {
    const row = await Design.findOne({ where: { id: designId, studyId }, transaction });
    if (!row) throw new NotFoundError('Design not found.');
    if (await DesignVersion.count({ where: { designId }, transaction })) throw new ConflictError('This design has frozen versions, which exports and power runs may cite; it cannot be deleted.');
    await recordAudit({ actorId, studyId, action: 'design.delete', details: { designId, name: row.name } }, transaction);
    await row.destroy({ transaction });
  });
}

/**
 * Freezes a design: an immutable version whose hash is the SHA-256 of the canonical JSON of
 * its content (the spec and a copy of the prior's values). Freezing an unchanged draft again
 * returns the existing version. The audit event ('design.freeze') is written in the same
 * transaction, and the version number is taken under a row lock on the design.
 */
export async function freezeDesign(actorId: number, studyId: number, designId: number): Promise<DesignVersion> {
  return (await freezeDesignReporting(actorId, studyId, designId)).version;
}

/** freezeDesign, also telling whether a new version was written (false: the draft was already frozen). */
export async function freezeDesignReporting(actorId: number, studyId: number, designId: number): Promise<{ version: DesignVersion; created: boolean }> {
  return db().transaction(async (transaction) => {
    const design = await Design.findOne({ where: { id: designId, studyId }, transaction, lock: transaction.LOCK.UPDATE });
    if (!design) throw new NotFoundError('Design not found.');
    const spec = designSpecSchema.parse(decodeJson(design.spec));
    const prior = await PriorSet.findOne({ where: { id: spec.priorSetId, studyId }, transaction });
    if (!prior) throw new ValidationError([{ path: 'priorSetId', message: 'The design’s prior set no longer exists; choose one before freezing.' }]);
    const content = frozenContent(spec, prior);
    const hash = contentHash(content);
    const latest = await DesignVersion.findOne({ where: { designId }, order: [['number', 'DESC']], transaction });
    if (latest && latest.hash === hash) return { version: latest, created: false };
    const version = await DesignVersion.create({ designId, studyId, number: (latest?.number ?? 0) + 1, hash, content, frozenBy: actorId }, { transaction });
    await recordAudit({ actorId, studyId, action: 'design.freeze', details: { designId, versionId: version.id, number: version.number, hash } }, transaction);
    return { version, created: true };
  });
}

export type VersionDto = VersionSummaryDto & { designId: number; content: FrozenDesign };

export function versionJson(row: DesignVersion): VersionDto {
  return { ...versionSummary(row), designId: row.designId, content: decodeJson(row.content) };
}

/** The study's frozen versions, newest first (optionally of one design). */
export async function listVersions(studyId: number, designId?: number): Promise<VersionDto[]> {
  db();
  const rows = await DesignVersion.findAll({ where: designId ? { studyId, designId } : { studyId }, order: [['createdAt', 'DESC'], ['id', 'DESC']] });
  return rows.map(versionJson);
}

/** One frozen version by numeric id or by its 64-hex content hash; 404 when not in this study. */
export async function getVersion(studyId: number, key: string): Promise<DesignVersion> {
  db();
  let row: DesignVersion | null = null;
  const id = parseRouteId(key);
  if (/^[0-9a-f]{64}$/i.test(key)) row = await DesignVersion.findOne({ where: { studyId, hash: key.toLowerCase() }, order: [['id', 'ASC']] });
  else if (id !== null) row = await DesignVersion.findOne({ where: { studyId, id } });
  if (!row) throw new NotFoundError('Frozen version not found.');
  return row;
}
