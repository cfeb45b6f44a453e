// Cross-site request forgery from a same-site origin: a page on another port of this host gets the
// session cookie sent along, so the server itself must refuse what such a page can send. The
// route-matrix test proves the refusal for every state-changing route; this file replays the
// attack that was found (an owner invitation created by a plain HTML form) and next-auth's posts.
import { beforeAll, describe, expect, it } from 'vitest';
import { POST as inviteRoute } from '@/app/api/studies/[id]/invitations/route';
import { POST as authPost } from '@/app/api/auth/[...nextauth]/route';
import { Invitation } from '@/db/models';
import { ctx, makeStudyWithTeam, migrateUp, requestAs } from '../support/integration';

beforeAll(migrateUp);

const OTHER_PORT = 'http://127.0.0.1:3130';

describe('cross-site protection', () => {
  it('refuses an owner invitation posted by an HTML form on another port, and creates nothing', async () => {
    const { study, team } = await makeStudyWithTeam('Cross-site form');
    const form = 'email=intruder%40elsewhere.example.org&role=owner';
    const request = await requestAs(team.owner, 'POST', `/api/studies/${study.id}/invitations`, {
      body: form,
      headers: { origin: OTHER_PORT, 'content-type': 'application/x-www-form-urlencoded', 'sec-fetch-site': 'same-site' },
    });
    const response = await inviteRoute(request, ctx({ id: String(study.id) }));
    expect(response.status).toBe(403);
    expect((await response.json()).error).toContain('cross-site protection');
    expect(await Invitation.count({ where: { studyId: study.id } })).toBe(0);
  });

  it('refuses the same invitation as JSON from another port, and accepts it from the app itself', async () => {
    const { study, team } = await makeStudyWithTeam('Cross-site JSON');
    const json = { email: 'invitee@elsewhere.example.org', role: 'viewer' };
    const foreign = await requestAs(team.owner, 'POST', `/api/studies/${study.id}/invitations`, { json, headers: { origin: OTHER_PORT } });
    expect((await inviteRoute(foreign, ctx({ id: String(study.id) }))).status).toBe(403);
    const own = await requestAs(team.owner, 'POST', `/api/studies/${study.id}/invitations`, { json });
    expect((await inviteRoute(own, ctx({ id: String(study.id) }))).status).toBe(201);
  });

  it.each([
    ['sign-in', '/api/auth/callback/credentials', ['callback', 'credentials']],
    ['sign-out', '/api/auth/signout', ['signout']],
  ])('refuses a %s form posted to next-auth from another origin', async (_label, path, segments) => {
    for (const origin of [OTHER_PORT, 'null']) {
      const request = await requestAs(null, 'POST', path, {
        body: 'csrfToken=copied&email=a%40b.example.org&password=x',
        headers: { origin, 'content-type': 'application/x-www-form-urlencoded' },
      });
      const response = await authPost(request, ctx({ nextauth: segments }));
      expect(response.status).toBe(403);
      expect((await response.json()).error).toContain('cross-site protection');
    }
  });
});
