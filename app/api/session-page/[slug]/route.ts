import type { NextRequest } from 'next/server';
import { route } from '@/lib/server/http/handler';
import { readJson } from '@/lib/server/http/read-json';
import { pageErrorResponse, pageReply, sessionTokenOf, takePageBudget } from '@/lib/server/http/session-page-route';
import { readPageState, takePageAction } from '@/lib/server/services/session-page/session-page';
import { pageActionSchema } from '@/lib/shared/validations/session-links';

/** The step a participant is on (?participant id in the link's parameter); writes nothing. */
export const GET = route<{ slug: string }>(async (request: NextRequest, { params }) => {
  const { slug } = await params;
  try {
    await takePageBudget(request, slug);
    const url = new URL(request.url);
    return pageReply(request, slug, await readPageState(slug, url.searchParams.get('participantId'), sessionTokenOf(request)));
  } catch (error) {
    return pageErrorResponse(error);
  }
});

/** One step of a participant: consent, begin (instructions read) or an answer to the current item. */
export const POST = route<{ slug: string }>(async (request: NextRequest, { params }) => {
  const { slug } = await params;
  try {
    await takePageBudget(request, slug);
    const action = await readJson(request, pageActionSchema);
    const outcome = await takePageAction(slug, action, sessionTokenOf(request));
    return pageReply(request, slug, outcome.state, outcome.token);
  } catch (error) {
    return pageErrorResponse(error);
  }
});
