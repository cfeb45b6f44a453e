// The later demo seeders: a finished power run with the audit event the app would write, and
// three batch-served participants; running them again adds nothing.
import { Op } from 'sequelize';
import { beforeAll, describe, expect, it } from 'vitest';
import { db } from '@/db';
import { AuditEvent, Participant, PowerRun, Study, User } from '@/db/models';
import { DEMO_STUDY_NAME, seed as seedTeam } from '@/db/seeders/01-demo-team';
import { seed as seedPlanner } from '@/db/seeders/02-demo-planner';
import { seed as seedItemBank } from '@/db/seeders/03-demo-item-bank';
import { DEMO_POWER_LABEL, seed as seedPower } from '@/db/seeders/04-demo-power';
import { migrateUp } from '../support/integration';

beforeAll(migrateUp);

describe('the demo item-bank and power seeders', () => {
  it('add served participants and a finished run with its audit event, once', async () => {
    await seedTeam(db());
    await seedPlanner(db());
    await seedItemBank(db());
    await seedPower(db());
    const study = (await Study.findAll({ where: { name: DEMO_STUDY_NAME } }))[0];
    const counts = async () => ({
      // the item-bank seeder's own participants (the results seeder adds HL-R…)
      participants: await Participant.count({ where: { studyId: study.id, participantId: { [Op.like]: 'HL-0%' } } }),
      runs: await PowerRun.count({ where: { studyId: study.id, label: DEMO_POWER_LABEL } }),
      starts: await AuditEvent.count({ where: { studyId: study.id, action: 'power-run.start' } }),
    });
    const before = await counts();
    expect(before).toEqual({ participants: 3, runs: 1, starts: 1 });
    await seedItemBank(db());
    await seedPower(db());
    expect(await counts()).toEqual(before);
    const run = await PowerRun.findOne({ where: { studyId: study.id, label: DEMO_POWER_LABEL } });
    expect(run?.status).toBe('finished');
    const event = await AuditEvent.findOne({ where: { studyId: study.id, action: 'power-run.start' } });
    expect(event?.details).toMatchObject({ runId: run!.id });
  }, 60_000);
});

describe('the demo accounts', () => {
  it('are seeded with confirmed addresses, and an older unconfirmed demo account is confirmed on the next seeding', async () => {
    const { demoAccounts } = await import('@/db/seeders/demo-accounts.mjs');
    await seedTeam(db());
    const owner = demoAccounts.find((a) => a.role === 'owner')!;
    await User.update({ emailVerifiedAt: null }, { where: { email: owner.email } });
    await seedTeam(db());
    for (const account of demoAccounts) {
      expect((await User.findOne({ where: { email: account.email } }))?.emailVerifiedAt, account.email).toBeInstanceOf(Date);
    }
  }, 60_000);
});
