// Changing a password while signed in: the current password is checked, every earlier session
// ends, open reset links stop working, and the change is audited with it.
import { beforeAll, describe, expect, it } from 'vitest';
import { PUT as changeRoute } from '@/app/api/account/password/route';
import { GET as listStudiesRoute } from '@/app/api/studies/route';
import { AuditEvent, PasswordResetToken } from '@/db/models';
import { TOO_MANY_ATTEMPTS, verifyCredentials } from '@/lib/server/auth/credentials';
import { newToken } from '@/lib/server/auth/tokens';
import { ctx, makeUser, migrateUp, requestAs, type TestUser } from '../support/integration';

beforeAll(migrateUp);

async function change(user: TestUser & { sessionEpoch?: number }, body: unknown, address = '10.9.0.1') {
  const response = await changeRoute(await requestAs(user, 'PUT', '/api/account/password', { json: body, headers: { 'x-forwarded-for': address } }), ctx({}));
  return { status: response.status, body: await response.json() };
}

describe('changing one’s password', () => {
  it('refuses a wrong current password by naming the field, and a short new one', async () => {
    const user = await makeUser('changer');
    const wrong = await change(user, { currentPassword: 'not-it-at-all', newPassword: 'a-new-passphrase' });
    expect(wrong.status).toBe(422);
    expect(wrong.body.issues).toEqual([{ path: 'currentPassword', message: 'This is not your current password.' }]);
    const short = await change(user, { currentPassword: user.password, newPassword: 'short' });
    expect(short.status).toBe(422);
    expect(short.body.issues.map((i: { path: string }) => i.path)).toEqual(['newPassword']);
    expect(await verifyCredentials(user.email, user.password, 'check')).not.toBeNull();
  });

  it('changes it, ends every earlier session, spends open reset links and audits the change', async () => {
    const user = await makeUser('changer');
    const { hash } = newToken();
    const reset = await PasswordResetToken.create({ userId: user.id, tokenHash: hash, expiresAt: new Date(Date.now() + 3_600_000), usedAt: null });
    const done = await change(user, { currentPassword: user.password, newPassword: 'a-new-passphrase' });
    expect(done.status).toBe(200);
    expect((await listStudiesRoute(await requestAs(user, 'GET', '/api/studies'), ctx({}))).status).toBe(401);
    expect(await verifyCredentials(user.email, user.password, 'check')).toBeNull();
    expect(await verifyCredentials(user.email, 'a-new-passphrase', 'check')).toMatchObject({ sessionEpoch: 1 });
    expect((await listStudiesRoute(await requestAs({ ...user, sessionEpoch: 1 }, 'GET', '/api/studies'), ctx({}))).status).toBe(200);
    expect((await PasswordResetToken.findByPk(reset.id))?.usedAt).not.toBeNull();
    expect(await AuditEvent.count({ where: { actorId: user.id, action: 'account.password-change' } })).toBe(1);
  });

  it('counts wrong guesses towards the sign-in limit and then answers 429', async () => {
    const user = await makeUser('guesser');
    const address = '10.9.0.77';
    for (let i = 0; i < 10; i++) expect((await change(user, { currentPassword: `guess-${i}`, newPassword: 'a-new-passphrase' }, address)).status).toBe(422);
    const blocked = await change(user, { currentPassword: user.password, newPassword: 'a-new-passphrase' }, address);
    expect(blocked.status).toBe(429);
    // The count is the account's, so sign-in from elsewhere waits out the same 15 minutes.
    await expect(verifyCredentials(user.email, user.password, 'elsewhere')).rejects.toThrow(TOO_MANY_ATTEMPTS);
  });
});
