import { NextResponse } from 'next/server';
import { route } from '@/lib/server/http/handler';
import { readBodyText } from '@/lib/server/http/read-json';
import { requireRole } from '@/lib/server/auth/session';
import { ValidationError } from '@/lib/server/errors';
import { loadVersion } from '@/lib/server/services/item-bank';
import { observedSummary, uploadChoices } from '@/lib/server/services/observed-choices';
import { CHOICES_MAX_BYTES } from '@/lib/shared/results/choices-csv';
import { DEFAULT_EXCLUSIONS, exclusionRulesSchema } from '@/lib/shared/validations/analysis';
import type { FrozenDesign } from '@/lib/shared/validations/planner';

type Params = { id: string };

/**
 * What has been observed for a frozen version (`?versionId=`): participants, those with answers,
 * those complete, and how many each exclusion rule (`&rules=` JSON, default all on) would remove.
 */
export const GET = route<Params>(async (request, { params }) => {
  const { study } = await requireRole(request, (await params).id, 'viewer');
  const search = request.nextUrl.searchParams;
  const version = await loadVersion(study.id, search.get('versionId') ?? '');
  let rules = DEFAULT_EXCLUSIONS;
  const raw = search.get('rules');
  if (raw !== null) {
    let value: unknown;
    try {
      value = JSON.parse(raw);
    } catch {
      throw new ValidationError([{ path: 'rules', message: 'Send the exclusion rules as JSON.' }]);
    }
    const parsed = exclusionRulesSchema.safeParse(value);
    if (!parsed.success) throw new ValidationError(parsed.error.issues.map((i) => ({ path: ['rules', ...i.path.map(String)].join('.'), message: i.message })));
    rules = parsed.data;
  }
  const content = (typeof version.content === 'string' ? JSON.parse(version.content) : version.content) as FrozenDesign;
  return NextResponse.json({ summary: await observedSummary(study.id, { id: version.id, hash: version.hash, content }, rules) });
});

/**
 * Imports observed stage-2 choices from a long-format CSV sent as the body (text/csv, at most
 * 5 MB): 422 naming line and column for bad cells, unknown participants or items never served;
 * 409 listing lines whose answer differs from the one on record; nothing is half-imported.
 */
export const POST = route<Params>(async (request, { params }) => {
  const { user, study } = await requireRole(request, (await params).id, 'operator');
  const text = await readBodyText(request, CHOICES_MAX_BYTES, 'The file is larger than 5 MB; upload at most 100,000 rows, or split it by participant.');
  return NextResponse.json({ report: await uploadChoices(study.id, user.id, text) });
});
