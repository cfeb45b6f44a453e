import { NextResponse } from 'next/server';
import { ApiError } from '@/lib/server/errors';
import { route } from '@/lib/server/http/handler';
import { requireRole } from '@/lib/server/auth/session';
import { fitPilotCsv } from '@/lib/shared/planner/pilot-csv';
import { readPilotModel, readPilotText } from '@/lib/server/http/pilot-upload';

/**
 * Fits a prior from a pilot CSV sent as the request body (text/csv, at most 5 MB): per-person rates,
 * or raw choices estimated under ?model= (default hyperbolic) with the calibration block's estimator.
 * Answers the fitted values for the editor to review and save; a file with problems gets 422
 * listing each line and column.
 */
export const POST = route<{ id: string }>(async (request, { params }) => {
  await requireRole(request, (await params).id, 'editor');
  const model = readPilotModel(request);
  const fit = fitPilotCsv(await readPilotText(request), { model });
  if (!fit.ok) throw new ApiError(422, fit.message, fit.issues.map((i) => ({ path: `line ${i.line}: ${i.field}`, message: i.message })));
  return NextResponse.json(fit);
}, { bodyTypes: ['text/csv'] });
