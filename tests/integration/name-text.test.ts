// Names with half a character (a lone surrogate) or a control character are refused with 422 naming
// the field, at the route, instead of being stored as something else; whole characters round-trip.
import { beforeAll, describe, expect, it } from 'vitest';
import { POST as createStudy } from '@/app/api/studies/route';
import { PATCH as patchStudy } from '@/app/api/studies/[id]/route';
import { POST as signUp } from '@/app/api/users/route';
import { Study } from '@/db/models';
import { ctx, makeUser, migrateUp, requestAs } from '../support/integration';

beforeAll(migrateUp);

describe('names at the API', () => {
  it('refuses a study name with a lone surrogate or a line break, naming the field', async () => {
    const user = await makeUser('namer');
    for (const name of ['Rainy \uD83C savings', 'Rainy\nsavings', 'Rainy\u0000savings']) {
      const response = await createStudy(await requestAs(user, 'POST', '/api/studies', { json: { name } }), ctx({}));
      expect(response.status, JSON.stringify(name)).toBe(422);
      const body = await response.json();
      expect(body.issues.map((i: { path: string }) => i.path)).toEqual(['name']);
      expect(body.issues[0].message).toMatch(/^The study name contains/);
    }
    expect(await Study.count({ where: { name: ['Rainy ? savings', 'Rainy \uFFFD savings'] } })).toBe(0);
  });

  it('keeps a name with whole emoji and accents exactly as typed', async () => {
    const user = await makeUser('namer');
    const name = 'Regentage 🌧️ — Åsa’s savings';
    const response = await createStudy(await requestAs(user, 'POST', '/api/studies', { json: { name } }), ctx({}));
    expect(response.status).toBe(201);
    const { study } = await response.json();
    expect((await Study.findByPk(study.id))?.name).toBe(name);

    const renamed = await patchStudy(await requestAs(user, 'PATCH', `/api/studies/${study.id}`, { json: { name: 'Half \uDF27', version: 1 } }), ctx({ id: String(study.id) }));
    expect(renamed.status).toBe(422);
    expect((await renamed.json()).issues[0].path).toBe('name');
  });

  it('refuses a person’s name with a control character at sign-up', async () => {
    const response = await signUp(
      await requestAs(null, 'POST', '/api/users', { json: { name: 'Pat\u0007 Example', email: `bell-${Date.now()}@tests.example.org`, password: 'long-enough-pass' } }),
      ctx({}),
    );
    expect(response.status).toBe(422);
    expect((await response.json()).issues).toEqual([{ path: 'name', message: 'The name contains a control character (such as a line break or a tab); remove it.' }]);
  });
});
