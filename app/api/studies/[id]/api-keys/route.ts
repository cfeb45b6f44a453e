import { NextResponse } from 'next/server';
import { route } from '@/lib/server/http/handler';
import { readJson } from '@/lib/server/http/read-json';
import { requireRole } from '@/lib/server/auth/session';
import { createApiKey, listApiKeys } from '@/lib/server/services/api-keys';
import { apiKeyCreateSchema } from '@/lib/shared/validations/api-keys';

/** The study's API keys: prefix, creator, last use (never the secret). */
export const GET = route<{ id: string }>(async (request, { params }) => {
  const { id } = await params;
  const { study } = await requireRole(request, id, 'operator');
  return NextResponse.json({ keys: await listApiKeys(study.id) });
});

/** Creates a key; the reply holds the secret, shown this once. */
export const POST = route<{ id: string }>(async (request, { params }) => {
  const { id } = await params;
  const { study, user } = await requireRole(request, id, 'operator');
  const input = await readJson(request, apiKeyCreateSchema);
  return NextResponse.json(await createApiKey(user.id, study.id, input), { status: 201 });
});
