import { NextResponse } from 'next/server';
import { route } from '@/lib/server/http/handler';
import { requireRole } from '@/lib/server/auth/session';
import { loadVersion, previewItemBank, readExportOptions } from '@/lib/server/services/item-bank';

/** The item bank of one frozen version, for the page (not a download, so not audited). */
export const GET = route<{ id: string; versionId: string }>(async (request, { params }) => {
  const { id, versionId } = await params;
  const { study } = await requireRole(request, id, 'operator');
  const options = readExportOptions(request);
  const version = await loadVersion(study.id, versionId);
  return NextResponse.json(previewItemBank(study, version, options));
});
