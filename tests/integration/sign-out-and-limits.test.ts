// Sessions end on the server at sign-out, and the sign-in limits count per account and per real
// client address, so neither a copied cookie nor a forged X-Forwarded-For header gets further.
import { afterEach, beforeAll, describe, expect, it } from 'vitest';
import type { JWT } from 'next-auth/jwt';
import { PUT as changeRoute } from '@/app/api/account/password/route';
import { GET as listStudiesRoute } from '@/app/api/studies/route';
import { EndedSession, User } from '@/db/models';
import { TOO_MANY_ATTEMPTS, verifyCredentials } from '@/lib/server/auth/credentials';
import { authOptions } from '@/lib/server/auth/options';
import { PEER_HEADER, setPeerHeaderStamped } from '@/lib/server/auth/client-address';
import { hashToken } from '@/lib/server/auth/tokens';
import { ctx, makeUser, migrateUp, requestAs, type TestUser } from '../support/integration';

beforeAll(migrateUp);
afterEach(() => setPeerHeaderStamped(false));

/** The claims next-auth's own jwt callback gives a fresh sign-in (session id included). */
async function signInClaims(user: TestUser): Promise<JWT> {
  const token = await authOptions.callbacks!.jwt!({ token: { sub: String(user.id), email: user.email, name: user.name }, user: { id: String(user.id), sessionEpoch: 0 } as never, trigger: 'signIn' } as never);
  return { ...token, exp: Math.floor(Date.now() / 1000) + 3600 };
}

async function studiesStatus(user: TestUser, claims: JWT) {
  return (await listStudiesRoute(await requestAs({ ...user, sid: claims.sid, sessionEpoch: claims.epoch as number }, 'GET', '/api/studies'), ctx({}))).status;
}

describe('signing out', () => {
  it('ends that session on the server: a copy of its cookie is refused afterwards, other sessions go on', async () => {
    const user = await makeUser('leaver');
    const laptop = await signInClaims(user);
    const phone = await signInClaims(user);
    expect(laptop.sid).toMatch(/^[A-Za-z0-9_-]{32}$/);
    expect(laptop.sid).not.toBe(phone.sid);
    expect(await studiesStatus(user, laptop)).toBe(200);

    await authOptions.events!.signOut!({ token: laptop, session: undefined as never });
    expect(await studiesStatus(user, laptop)).toBe(401); // the copied cookie
    expect(await studiesStatus(user, phone)).toBe(200);
    const ended = await EndedSession.findOne({ where: { userId: user.id } });
    expect(ended?.sessionHash).toBe(hashToken(laptop.sid!)); // only the hash is kept
    expect(Math.abs(ended!.expiresAt.getTime() - Number(laptop.exp) * 1000)).toBeLessThan(1000);
  });

  it('ends every session of a token from before session ids, as a password change does', async () => {
    const user = await makeUser('old-token');
    const old = { sub: String(user.id), epoch: 0 } as JWT;
    expect((await listStudiesRoute(await requestAs(user, 'GET', '/api/studies'), ctx({}))).status).toBe(200);
    await authOptions.events!.signOut!({ token: old, session: undefined as never });
    expect((await listStudiesRoute(await requestAs(user, 'GET', '/api/studies'), ctx({}))).status).toBe(401);
    expect((await User.findByPk(user.id))?.sessionEpoch).toBe(1);
  });
});

describe('the sign-in limits', () => {
  it('count failures per account from any address: the 11th try is refused even with the right password', async () => {
    const user = await makeUser('targeted');
    for (let i = 0; i < 10; i++) expect(await verifyCredentials(user.email, `wrong-${i}`, `198.51.100.${i + 1}`)).toBeNull();
    await expect(verifyCredentials(user.email, user.password, '198.51.100.200')).rejects.toThrow(TOO_MANY_ATTEMPTS);
  });

  it('count failures per client address whichever accounts they name', async () => {
    for (let i = 0; i < 30; i++) expect(await verifyCredentials(`nobody-${i}@tests.example.org`, 'guess', '192.0.2.77')).toBeNull();
    const user = await makeUser('bystander');
    await expect(verifyCredentials(user.email, user.password, '192.0.2.77')).rejects.toThrow(TOO_MANY_ATTEMPTS);
    expect(await verifyCredentials(user.email, user.password, '192.0.2.78')).not.toBeNull();
  });

  it('are not reset by a forged X-Forwarded-For on the password change: the 11th wrong guess gets 429', async () => {
    setPeerHeaderStamped(true); // as scripts/serve.mjs does: the peer header is the socket's
    const user = await makeUser('changer');
    const change = async (currentPassword: string, forged: string) =>
      (
        await changeRoute(
          await requestAs(user, 'PUT', '/api/account/password', { json: { currentPassword, newPassword: 'a-new-passphrase' }, headers: { [PEER_HEADER]: '192.0.2.9', 'x-forwarded-for': forged } }),
          ctx({}),
        )
      ).status;
    for (let i = 0; i < 10; i++) expect(await change(`guess-${i}`, `203.0.113.${i}`)).toBe(422);
    expect(await change(user.password, '203.0.113.99')).toBe(429);
  });
});
