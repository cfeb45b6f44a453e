import { beforeAll, describe, expect, it } from 'vitest';
import { verifyCredentials, TOO_MANY_ATTEMPTS } from '@/lib/server/auth/credentials';
import { POST as signUp } from '@/app/api/users/route';
import { ctx, makeUser, migrateUp, requestAs } from '../support/integration';

beforeAll(migrateUp);

describe('signing in with e-mail and password', () => {
  it('refuses a wrong password and accepts the right one', async () => {
    const user = await makeUser('signer');
    expect(await verifyCredentials(user.email, 'not-the-password', '10.0.0.1')).toBeNull();
    expect(await verifyCredentials(user.email, user.password, '10.0.0.1')).toEqual({ id: String(user.id), email: user.email, name: user.name, sessionEpoch: 0 });
  });

  it('treats the e-mail case-insensitively and an unknown e-mail as a plain failure', async () => {
    const user = await makeUser('casing');
    expect(await verifyCredentials(user.email.toUpperCase(), user.password, '10.0.0.2')).not.toBeNull();
    expect(await verifyCredentials('nobody@tests.example.org', 'whatever-password', '10.0.0.2')).toBeNull();
  });

  it('blocks an e-mail after 10 failures in 15 minutes, even with the right password and from another address', async () => {
    const user = await makeUser('limited');
    for (let i = 0; i < 10; i++) expect(await verifyCredentials(user.email, `wrong-${i}`, '10.0.0.3')).toBeNull();
    await expect(verifyCredentials(user.email, user.password, '10.0.0.3')).rejects.toThrow(TOO_MANY_ATTEMPTS);
    await expect(verifyCredentials(user.email, user.password, '10.0.0.4')).rejects.toThrow(TOO_MANY_ATTEMPTS);
  });
});

describe('signing up', () => {
  it('creates an account that can sign in, and a second sign-up with the same e-mail changes nothing', async () => {
    const body = { name: 'Pat Example', email: `new-${Date.now()}@tests.example.org`, password: 'correct horse battery' };
    const first = await signUp(await requestAs(null, 'POST', '/api/users', { json: body }), ctx({}));
    expect(first.status).toBe(202);
    expect(await verifyCredentials(body.email, body.password, '10.0.0.5')).not.toBeNull();
    const again = await signUp(await requestAs(null, 'POST', '/api/users', { json: { ...body, name: 'Someone Else', password: 'another passphrase' } }), ctx({}));
    expect(again.status).toBe(202);
    expect(await verifyCredentials(body.email, 'another passphrase', '10.0.0.5')).toBeNull();
    expect(await verifyCredentials(body.email, body.password, '10.0.0.5')).toMatchObject({ name: 'Pat Example' });
  });

  it('names the fields of an invalid sign-up', async () => {
    const response = await signUp(await requestAs(null, 'POST', '/api/users', { json: { name: '', email: 'not-an-email', password: 'short' } }), ctx({}));
    expect(response.status).toBe(422);
    const paths = (await response.json()).issues.map((i: { path: string }) => i.path);
    expect(paths).toEqual(expect.arrayContaining(['name', 'email', 'password']));
  });
});
