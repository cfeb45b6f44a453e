import { Design, PriorSet } from '@/db/models';
import { db } from '@/db';
import { ConflictError, NotFoundError } from '@/lib/server/errors';
import type { PriorSetInput, PriorValues } from '@/lib/shared/validations/planner';
import { priorSetSchema } from '@/lib/shared/validations/planner';
import { recordAudit } from './audit';

export type PriorSetDto = {
  id: number;
  name: string;
  values: PriorValues;
  source: 'manual' | 'pilot';
  notes: string;
  version: number;
  createdAt: string;
  updatedAt: string;
};

/** The JSON form of a prior set. */
export function priorJson(row: PriorSet): PriorSetDto {
  return {
    id: row.id,
    name: row.name,
    values: row.values,
    source: row.source,
    notes: row.notes,
    version: row.version,
    createdAt: row.createdAt.toISOString(),
    updatedAt: row.updatedAt.toISOString(),
  };
}

function split(input: PriorSetInput) {
  const parsed = priorSetSchema.parse(input);
  const { name, source, notes, ...values } = parsed;
  return { name, source, notes, values };
}

/** The study's prior sets, by name. */
export async function listPriors(studyId: number): Promise<PriorSetDto[]> {
  db();
  const rows = await PriorSet.findAll({ where: { studyId }, order: [['name', 'ASC'], ['id', 'ASC']] });
  return rows.map(priorJson);
}

/** One prior set of the study; 404 when it belongs to another study or does not exist. */
export async function getPrior(studyId: number, priorId: number): Promise<PriorSet> {
  db();
  const row = await PriorSet.findOne({ where: { id: priorId, studyId } });
  if (!row) throw new NotFoundError('Prior set not found.');
  return row;
}

/** Creates a named prior set (manual or fitted from pilot data). */
export async function createPrior(actorId: number, studyId: number, input: PriorSetInput): Promise<PriorSet> {
  const { name, source, notes, values } = split(input);
  return db().transaction(async (transaction) => {
    const row = await PriorSet.create({ studyId, name, source, notes, values, createdBy: actorId }, { transaction });
    await recordAudit({ actorId, studyId, action: 'prior.create', details: { priorId: row.id, name } }, transaction);
    return row;
  });
}

/**
 * Saves a prior set if the stored version is still `version` (one UPDATE checks and writes, so
 * two racing editors cannot both win); otherwise 409 and nothing is written.
 */
export async function updatePrior(actorId: number, studyId: number, priorId: number, input: PriorSetInput, version: number): Promise<PriorSet> {
  const { name, source, notes, values } = split(input);
  return db().transaction(async (transaction) => {
    const [affected] = await PriorSet.update({ name, source, notes, values, version: version + 1 }, { where: { id: priorId, studyId, version }, transaction });
    if (affected === 0) {
      const exists = await PriorSet.count({ where: { id: priorId, studyId }, transaction });
      if (!exists) throw new NotFoundError('Prior set not found.');
      throw new ConflictError('This prior set was changed by someone else since you loaded it. Reload to see their version; your numbers stay in the form.');
    }
    await recordAudit({ actorId, studyId, action: 'prior.update', details: { priorId, name, version: version + 1 } }, transaction);
    return (await PriorSet.findByPk(priorId, { transaction }))!;
  });
}

/** Deletes a prior set no design uses (409 otherwise: frozen and draft designs keep pointing at it). */
export async function deletePrior(actorId: number, studyId: number, priorId: number): Promise<void> {
  await db().transaction(async (transaction) => {
    const row = await PriorSet.findOne({ where: { id: priorId, studyId }, transaction });
    if (!row) throw new NotFoundError('Prior set not found.');
    const designs = await Design.findAll({ where: { studyId }, attributes: ['id', 'spec'], transaction });
    const users = designs.filter((d) => d.spec.priorSetId === priorId).length;
    if (users) throw new ConflictError(`${users} design${users === 1 ? ' uses' : 's use'} this prior set; point ${users === 1 ? 'it' : 'them'} at another prior first.`);
    await recordAudit({ actorId, studyId, action: 'prior.delete', details: { priorId, name: row.name } }, transaction);
    await row.destroy({ transaction });
  });
}
