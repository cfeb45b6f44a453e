// Optional e-mail notices: each user's setting decides, the person who acted is not told about
// their own freeze, and the messages really go through the fake SMTP server.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { GET as getNotices, PUT as putNotices } from '@/app/api/account/notices/route';
import { notifyDesignFrozen, notifyPowerRunFinished } from '@/lib/services/notices';
import { ctx, makeStudyWithTeam, migrateUp, requestAs, type TestUser } from '../support/integration';
import { startTestMailbox, type TestMailbox } from '../support/mail';

let mailbox: TestMailbox;
beforeAll(async () => {
  mailbox = await startTestMailbox();
  await migrateUp();
});
afterAll(() => mailbox.stop());

async function choose(user: TestUser, settings: unknown) {
  const response = await putNotices(await requestAs(user, 'PUT', '/api/account/notices', { json: settings }), ctx({}));
  return { status: response.status, body: await response.json() };
}

describe('notice settings', () => {
  it('start all off and are saved per user', async () => {
    const { team } = await makeStudyWithTeam('Notice settings');
    const initial = await (await getNotices(await requestAs(team.viewer, 'GET', '/api/account/notices'), ctx({}))).json();
    expect(initial.notices).toEqual({ designFrozen: false, powerRunFinished: false });
    expect(await choose(team.viewer, { designFrozen: true, powerRunFinished: false })).toEqual({
      status: 200,
      body: { notices: { designFrozen: true, powerRunFinished: false } },
    });
    const bad = await choose(team.viewer, { designFrozen: 'often' });
    expect(bad.status).toBe(422);
  });
});

describe('sending notices', () => {
  it('mails only members who turned a notice on, and not the person who froze', async () => {
    const { study, team } = await makeStudyWithTeam('Notices sent');
    await choose(team.viewer, { designFrozen: true, powerRunFinished: true });
    await choose(team.editor, { designFrozen: true, powerRunFinished: false });
    await choose(team.operator, { designFrozen: false, powerRunFinished: false });

    expect(await notifyDesignFrozen(study.id, 'c0ffee'.repeat(10) + 'beef', team.editor.id)).toBe(1);
    expect(await notifyPowerRunFinished(study.id, 77)).toBe(1);
    const mine = (await mailbox.all()).filter((m) => m.subject.includes('Notices sent'));
    expect(mine.map((m) => m.to).sort()).toEqual([team.viewer.email, team.viewer.email]);
    expect(mine.map((m) => m.subject).sort()).toEqual(['A design was frozen in \u201cNotices sent\u201d', 'Power run #77 finished in \u201cNotices sent\u201d']);
  });

  it('never throws into the caller, even for a missing study', async () => {
    await expect(notifyPowerRunFinished(999_999_999, 1)).resolves.toBe(0);
  });
});
