// Optional e-mail notices: each user's setting decides, the person who acted is not told about
// their own freeze, and the messages really go through the fake SMTP server.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { GET as getNotices, PUT as putNotices } from '@/app/api/account/notices/route';
import { POST as createPrior } from '@/app/api/studies/[id]/priors/route';
import { POST as createDesign } from '@/app/api/studies/[id]/designs/route';
import { POST as freeze } from '@/app/api/studies/[id]/designs/[designId]/freeze/route';
import { POST as startRun } from '@/app/api/studies/[id]/power-runs/route';
import { PowerRun } from '@/db/models';
import { defaultSpec } from '@/lib/shared/planner/design-form-values';
import { notifyDesignFrozen, notifyPowerRunFinished } from '@/lib/server/services/notices';
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

describe('notices from the real changes', () => {
  it('a freeze through the API and a finished power run each reach a subscriber once', async () => {
    const { study, team } = await makeStudyWithTeam('Wired notices');
    const id = String(study.id);
    await choose(team.viewer, { designFrozen: true, powerRunFinished: true });
    const call = async (handler: (r: never, c: never) => Promise<Response>, path: string, params: Record<string, string>, json?: unknown) => {
      const response = await handler((await requestAs(team.editor, 'POST', `/api/studies/${id}${path}`, json === undefined ? {} : { json })) as never, ctx({ id, ...params }) as never);
      return { status: response.status, body: await response.json() };
    };
    const prior = await call(createPrior, '/priors', {}, { name: 'Wired prior', medianSmall: 0.02, medianLarge: 0.008, sdLogSmall: 0.8, sdLogLarge: 0.8, correlation: 0.6 });
    const design = await call(createDesign, '/designs', {}, defaultSpec('Wired design', prior.body.prior.id));
    const designId = String(design.body.design.id);
    const frozen = await call(freeze, `/designs/${designId}/freeze`, { designId });
    expect(frozen.status).toBe(201);
    const frozenMail = await mailbox.waitFor((m) => m.subject.includes('Wired notices') && m.subject.startsWith('A design was frozen'));
    expect(frozenMail.to).toBe(team.viewer.email);
    expect(frozenMail.text).toContain(frozen.body.version.hash.slice(0, 12));
    // freezing again without a change creates nothing, so it sends nothing
    expect((await call(freeze, `/designs/${designId}/freeze`, { designId })).status).toBe(200);

    const run = await call(startRun, '/power-runs', {}, {
      designVersionId: frozen.body.version.id,
      label: 'Wired run',
      truth: { model: { id: 'hyperbolic' }, prior: { medianSmall: 0.02, medianLarge: 0.008, sdLogSmall: 0.8, sdLogLarge: 0.8, correlation: 0.6 }, gamma: 10, lapse: 0.02 },
      calibration: 'simulated',
      test: { kind: 'mcnemar', alpha: 0.05, alternative: 'greater' },
      sampleSizes: [5, 10],
      replications: 20,
      seed: 3,
    });
    expect(run.status).toBe(202);
    const runId = run.body.run.id as number;
    const finishedMail = await mailbox.waitFor((m) => m.subject === `Power run #${runId} finished in \u201cWired notices\u201d`, 90_000);
    expect(finishedMail.to).toBe(team.viewer.email);
    expect((await PowerRun.findByPk(runId))?.status).toBe('finished');
    const mine = (await mailbox.all()).filter((m) => m.subject.includes('Wired notices'));
    expect(mine).toHaveLength(2);
  }, 120_000);
});
