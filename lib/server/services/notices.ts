import { QueryTypes } from 'sequelize';
import { NoticeSetting, Study, User } from '@/db/models';
import { db } from '@/db';
import { appLink } from '@/lib/server/mail/links';
import { designFrozenMessage, powerRunFinishedMessage } from '@/lib/server/mail/templates';
import { queueMail } from '@/lib/server/mail/transport';
import type { NoticeSettingsInput } from '@/lib/shared/validations/team';

/** A user's notice settings; all off until they choose otherwise. */
export async function getNoticeSettings(userId: number): Promise<NoticeSettingsInput> {
  db();
  const row = await NoticeSetting.findByPk(userId);
  return { designFrozen: row?.designFrozen ?? false, powerRunFinished: row?.powerRunFinished ?? false };
}

/** Saves a user's notice settings (the whole set; the form always sends both). */
export async function updateNoticeSettings(userId: number, input: NoticeSettingsInput): Promise<NoticeSettingsInput> {
  db();
  await NoticeSetting.upsert({ userId, designFrozen: input.designFrozen, powerRunFinished: input.powerRunFinished });
  return getNoticeSettings(userId);
}

type Column = 'design_frozen' | 'power_run_finished';

/** Members of a study who turned a notice on, with their addresses. */
async function subscribers(studyId: number, column: Column, exceptUserId: number | null) {
  return db().query<{ id: number; email: string }>(
    `SELECT u.id, u.email FROM memberships m
       JOIN users u ON u.id = m.user_id
       JOIN notice_settings n ON n.user_id = m.user_id AND n.${column} = TRUE
      WHERE m.study_id = :studyId AND (:except IS NULL OR m.user_id <> :except)
      ORDER BY u.id`,
    { replacements: { studyId, except: exceptUserId }, type: QueryTypes.SELECT },
  );
}

/** Sends one notice per subscriber; never throws (a notice must not break the change it reports). */
async function sendAll(label: string, run: () => Promise<Array<Promise<boolean>>>): Promise<number> {
  try {
    const results = await Promise.all(await run());
    return results.filter(Boolean).length;
  } catch (error) {
    console.error(`[switchback] could not send ${label} notices:`, error instanceof Error ? error.message : error);
    return 0;
  }
}

/**
 * E-mails the study's members who asked for it (not the person who froze) that a design was frozen.
 * Call after the freeze has committed. Resolves to the number of messages sent; never rejects.
 */
export function notifyDesignFrozen(studyId: number, versionHash: string, actorId: number | null): Promise<number> {
  return sendAll('design-frozen', async () => {
    const study = await Study.findByPk(studyId);
    if (!study) return [];
    const actor = actorId ? await User.findByPk(actorId, { attributes: ['name'] }) : null;
    const link = appLink(`/studies/${studyId}/designs`);
    return (await subscribers(studyId, 'design_frozen', actorId)).map((s) =>
      queueMail(designFrozenMessage({ to: s.email, studyName: study.name, actorName: actor?.name ?? 'A team member', versionHash, link }), 'a design-frozen notice'),
    );
  });
}

/**
 * E-mails the study's members who asked for it that a power run finished. Call when the run's
 * result is stored. Resolves to the number of messages sent; never rejects.
 */
export function notifyPowerRunFinished(studyId: number, runId: number): Promise<number> {
  return sendAll('power-run', async () => {
    const study = await Study.findByPk(studyId);
    if (!study) return [];
    const link = appLink(`/studies/${studyId}/power/${runId}`);
    return (await subscribers(studyId, 'power_run_finished', null)).map((s) =>
      queueMail(powerRunFinishedMessage({ to: s.email, studyName: study.name, runId, link }), 'a power-run notice'),
    );
  });
}
