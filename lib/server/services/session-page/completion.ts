import type { PageCompletion } from '@/lib/shared/session-page';

/** What the completion step needs of a link. */
export type CompletionLink = { completionCode: string; redirectUrl: string | null; participantParam: string };

/**
 * The completion screen of a finished session: the link's completion code and, when the link has
 * a redirect, its address with the participant id added in the link's parameter (as online
 * panels expect). Extend the reply here (e.g. a reward to show), not in the page.
 */
export function completionFor(link: CompletionLink, participantId: string): PageCompletion {
  let redirectUrl: string | null = null;
  if (link.redirectUrl) {
    const url = new URL(link.redirectUrl);
    url.searchParams.set(link.participantParam, participantId);
    redirectUrl = url.toString();
  }
  return { code: link.completionCode, redirectUrl };
}
