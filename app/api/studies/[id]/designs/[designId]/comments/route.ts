import { NextResponse } from 'next/server';
import { route } from '@/lib/server/http/handler';
import { readJson } from '@/lib/server/http/read-json';
import { requireRole } from '@/lib/server/auth/session';
import { addComment, listComments } from '@/lib/server/services/planner-comments';
import { parseEntityId } from '@/lib/server/route-ids';
import { commentSchema } from '@/lib/shared/validations/planner';

type Params = { id: string; designId: string };

export const GET = route<Params>(async (request, { params }) => {
  const p = await params;
  const { study } = await requireRole(request, p.id, 'viewer');
  return NextResponse.json({ comments: await listComments(study.id, parseEntityId(p.designId, 'Design')) });
});

/** Any member, viewers included, may comment on a design. */
export const POST = route<Params>(async (request, { params }) => {
  const p = await params;
  const { user, study } = await requireRole(request, p.id, 'viewer');
  const { text } = await readJson(request, commentSchema);
  return NextResponse.json({ comment: await addComment(user.id, study.id, parseEntityId(p.designId, 'Design'), text) }, { status: 201 });
});
