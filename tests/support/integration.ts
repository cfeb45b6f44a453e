// Shared set-up for integration tests: the real MariaDB test instance (started by scripts/test.mjs,
// DB_* in the environment), migrations applied, and requests signed as a given user.
import bcrypt from 'bcryptjs';
import { randomUUID } from 'node:crypto';
import { encode } from 'next-auth/jwt';
import { NextRequest } from 'next/server';
import { db } from '@/db';
import { createMigrator } from '@/db/migrator';
import { Membership, Study, User } from '@/db/models';
import type { Role } from '@/lib/shared/roles';

export const BASE = 'http://127.0.0.1:3100';

if (!process.env.NEXTAUTH_SECRET) process.env.NEXTAUTH_SECRET = 'integration-tests-secret-0123456789';

/** Applies every migration (a no-op when the schema is current). */
export async function migrateUp() {
  await createMigrator(db()).up();
}

export type TestUser = { id: number; email: string; name: string; password: string };

/**
 * A new user with a unique e-mail; bcrypt cost 4 keeps set-up quick (the app uses 10). The address
 * counts as confirmed unless `verified: false`.
 */
export async function makeUser(label = 'user', options: { verified?: boolean } = {}): Promise<TestUser> {
  const password = `pw-${randomUUID()}`;
  const email = `${label}-${randomUUID().slice(0, 8)}@tests.example.org`;
  const emailVerifiedAt = options.verified === false ? null : new Date();
  const user = await User.create({ email, name: `Test ${label}`, passwordHash: await bcrypt.hash(password, 4), emailVerifiedAt });
  return { id: user.id, email, name: user.name, password };
}

/** A study with one member per role, plus a signed-in outsider. */
export async function makeStudyWithTeam(name = 'Matrix study') {
  const study = await Study.create({ name, description: '' });
  const team = {} as Record<Role, TestUser>;
  for (const role of ['owner', 'editor', 'operator', 'viewer'] as const) {
    team[role] = await makeUser(role);
    await Membership.create({ userId: team[role].id, studyId: study.id, role });
  }
  const outsider = await makeUser('outsider');
  return { study, team, outsider };
}

/** A NextRequest carrying a session cookie for `user` (or none), as the browser would send it. */
export async function requestAs(
  user: (Pick<TestUser, 'id' | 'email' | 'name'> & { sessionEpoch?: number; sid?: string }) | null,
  method: string,
  path: string,
  options: { json?: unknown; body?: string; headers?: Record<string, string> } = {},
): Promise<NextRequest> {
  const headers: Record<string, string> = { ...options.headers };
  if (user) {
    const claims = { sub: String(user.id), email: user.email, name: user.name, epoch: user.sessionEpoch ?? 0, ...(user.sid ? { sid: user.sid } : {}) };
    const token = await encode({ token: claims, secret: process.env.NEXTAUTH_SECRET! });
    headers.cookie = `next-auth.session-token=${token}`;
  }
  let body = options.body;
  if (options.json !== undefined) {
    body = JSON.stringify(options.json);
    headers['content-type'] = 'application/json';
  }
  return new NextRequest(`${BASE}${path}`, { method, headers, body });
}

/** The route context Next passes to handlers: params as a promise. */
// eslint-disable-next-line @typescript-eslint/no-explicit-any -- handlers each declare their own params shape
export function ctx(params: Record<string, string | string[]>): { params: Promise<any> } {
  return { params: Promise.resolve(params) };
}
