import { NextResponse } from 'next/server';
import { route } from '@/lib/server/http/handler';
import { readJson } from '@/lib/server/http/read-json';
import { requireRole } from '@/lib/server/auth/session';
import { loadVersion } from '@/lib/server/services/item-bank';
import { batchCsv, serveBatch } from '@/lib/server/services/item-bank-batch';
import { PERSON_CAUTION } from '@/lib/shared/cautions';
import { batchRequestSchema } from '@/lib/shared/validations/item-bank';

/** Serves many participants from a CSV of offline calibration answers; ?format=csv returns CSV. */
export const POST = route<{ id: string }>(async (request, { params }) => {
  const { id } = await params;
  const { study, user } = await requireRole(request, id, 'operator');
  const input = await readJson(request, batchRequestSchema);
  const version = await loadVersion(study.id, input.designVersionId);
  const results = await serveBatch(version, input.csv, user.id);
  if (new URL(request.url).searchParams.get('format') === 'csv') {
    return new Response(batchCsv(results), {
      headers: { 'Content-Type': 'text/csv; charset=utf-8', 'Content-Disposition': `attachment; filename="switchback-batch-${study.id}-${version.hash.slice(0, 12)}.csv"` },
    });
  }
  return NextResponse.json({ results, caution: PERSON_CAUTION });
});
