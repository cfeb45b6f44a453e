import { randomBytes } from 'node:crypto';
import { QueryTypes } from 'sequelize';
import { db } from '@/db';
import { SessionLink } from '@/db/models';
import type { StoredSessionStatus } from '@/db/models/session';
import { ConflictError, NotFoundError } from '@/lib/server/errors';
import { ItemBankInputError, serveParticipant } from '@/lib/design';
import { ValidationError } from '@/lib/server/errors';
import { sessionLinkCreateSchema, sessionLinkStatusSchema, type PreviewState, previewStateSchema, type SessionLinkCreateInput } from '@/lib/shared/validations/session-links';
import type { PageState } from '@/lib/shared/session-page';
import { recordAudit } from './audit';
import { bankOrInvalid, frozenVersionById, loadVersion } from './item-bank';
import { countByStatus, sessionState } from './session-status';
import { newSlug, pageItems, pageLinkOf } from './session-page/session-page';
import type { SessionLinkDto } from '@/lib/shared/session-page';
import { currentStep } from './session-page/steps';
import { nextCalibrationItem } from './session-page/calibration-step';

// Participant links to the session page, as operators manage them (a "Session links" area of the study).


function linkJson(link: SessionLink, sessions: SessionRow[], idleMinutes: number, now: Date): SessionLinkDto {
  const mine = sessions.filter((s) => Number(s.session_link_id) === link.id);
  const statuses = mine.map((s) => ({
    status: sessionState({ stored: s.status, served: s.served !== null, lastActivityAt: new Date(s.last_activity_at), idleMinutes, now }),
  }));
  const attentionFailures = mine
    .map((s) => ({
      participantId: s.participant_id,
      checks: [...(s.calibration_check === 'failed' ? ['calibration'] : []), ...(s.probe_check === 'LL' ? ['stage 2'] : [])],
    }))
    .filter((f) => f.checks.length > 0);
  return {
    id: link.id,
    name: link.name,
    title: link.title,
    designVersionId: link.designVersionId,
    status: link.status,
    path: `/s/${link.slug}`,
    participantParam: link.participantParam,
    consentText: link.consentText,
    instructions: link.instructions,
    completionCode: link.completionCode,
    redirectUrl: link.redirectUrl,
    createdAt: link.createdAt.toISOString(),
    counts: countByStatus(statuses),
    attentionFailures,
  };
}

type SessionRow = {
  session_link_id: number;
  participant_id: string;
  status: StoredSessionStatus;
  served: number | null;
  last_activity_at: Date;
  calibration_check: string | null;
  probe_check: string | null;
};

// The attention checks: the calibration block's (stored with the served participant) and the
// stage-2 block's (its answer; choosing the later, dominated option fails it).
const LINK_SESSIONS_SQL = `
  SELECT s.session_link_id, s.participant_id, s.status, p.id AS served, s.last_activity_at,
         JSON_UNQUOTE(JSON_EXTRACT(p.result, '$.attentionCheck')) AS calibration_check,
         (SELECT a.chosen FROM stage2_answers a WHERE a.participant_ref = p.id AND a.item_id = 'check-probe') AS probe_check
    FROM participant_sessions s
    LEFT JOIN participants p ON p.study_id = s.study_id AND p.participant_id = s.participant_id
   WHERE s.study_id = :studyId AND s.session_link_id IS NOT NULL`;

/** The study's participant links, newest first. */
export async function listSessionLinks(study: { id: number; sessionIdleMinutes: number }): Promise<SessionLinkDto[]> {
  const sequelize = db();
  const links = await SessionLink.findAll({ where: { studyId: study.id }, order: [['id', 'DESC']] });
  const sessions = await sequelize.query<SessionRow>(LINK_SESSIONS_SQL, { replacements: { studyId: study.id }, type: QueryTypes.SELECT });
  const now = new Date();
  return links.map((link) => linkJson(link, sessions, study.sessionIdleMinutes, now));
}

/** Creates a participant link for a frozen version of the study (audited); a completion code is generated when none is given. */
export async function createSessionLink(actorId: number, study: { id: number; sessionIdleMinutes: number }, raw: SessionLinkCreateInput): Promise<SessionLinkDto> {
  const input = sessionLinkCreateSchema.parse(raw);
  const version = await loadVersion(study.id, input.designVersionId);
  bankOrInvalid(version); // refuse a link for a design that cannot serve items
  const link = await db().transaction(async (transaction) => {
    const created = await SessionLink.create(
      {
        studyId: study.id,
        designVersionId: version.id,
        slug: newSlug(),
        name: input.name,
        title: input.title,
        consentText: input.consentText,
        instructions: input.instructions,
        completionCode: input.completionCode || randomBytes(6).toString('hex').toUpperCase(),
        redirectUrl: input.redirectUrl || null,
        participantParam: input.participantParam,
        createdBy: actorId,
      },
      { transaction },
    );
    await recordAudit({ actorId, studyId: study.id, action: 'session-link.create', details: { linkId: created.id, name: input.name, designVersionId: version.id } }, transaction);
    return created;
  });
  return linkJson(link, [], study.sessionIdleMinutes, new Date());
}

async function linkOfStudy(studyId: number, rawLinkId: string): Promise<SessionLink> {
  const id = Number(rawLinkId);
  db();
  const link = Number.isSafeInteger(id) && id > 0 ? await SessionLink.findOne({ where: { id, studyId } }) : null;
  if (!link) throw new NotFoundError('Session link not found.');
  return link;
}

/** Opens, pauses or closes a link (audited). Closing is final: a closed link cannot be reopened (409). */
export async function setSessionLinkStatus(actorId: number, study: { id: number; sessionIdleMinutes: number }, rawLinkId: string, raw: unknown): Promise<SessionLinkDto> {
  const { status } = sessionLinkStatusSchema.parse(raw);
  const link = await linkOfStudy(study.id, rawLinkId);
  await db().transaction(async (transaction) => {
    const locked = (await SessionLink.findByPk(link.id, { transaction, lock: transaction.LOCK.UPDATE }))!;
    if (locked.status === 'closed' && status !== 'closed') throw new ConflictError('This link is closed for good; create a new link to collect more sessions.');
    const before = locked.status;
    await locked.update({ status }, { transaction });
    await recordAudit({ actorId, studyId: study.id, action: 'session-link.status', details: { linkId: link.id, from: before, to: status } }, transaction);
  });
  const [dto] = (await listSessionLinks(study)).filter((l) => l.id === link.id);
  return dto!;
}

/**
 * A team member's run through a link (preview): the same steps as a participant's, computed by
 * the same functions from what the preview answered so far (sent along by the page), with the
 * stage-2 items served as the probe-items API would serve them, and nothing stored.
 */
export async function previewSessionLink(studyId: number, rawLinkId: string, raw: PreviewState): Promise<PageState> {
  const state = previewStateSchema.parse(raw);
  const link = await linkOfStudy(studyId, rawLinkId);
  const version = await frozenVersionById(link.designVersionId);
  const { items, bank, locate } = pageItems(version);
  const known = new Set(items.calibration.map((i) => i.id));
  const calibration = Object.fromEntries(Object.entries(state.calibration).filter(([id]) => known.has(id)));
  let served = null;
  try {
    if (nextCalibrationItem(items, calibration, 'preview') === null) served = serveParticipant(version.content, bank, { participantId: 'preview', responses: calibration, locate }).items;
  } catch (error) {
    if (error instanceof ItemBankInputError) throw new ValidationError(error.issues, 'Some calibration responses are invalid.');
    throw error;
  }
  const servedIds = new Set((served ?? []).map((i) => i.id));
  const stage2 = new Map(Object.entries(state.stage2).filter(([id]) => servedIds.has(id)));
  const step = currentStep(link, 'preview', items, { consented: state.consented, instructionsRead: state.begun, calibration, served, stage2 });
  return { link: pageLinkOf(link), participantId: 'preview', step, preview: true };
}
