// What the session page's server tells the page to show next: the page draws whatever step it is
// given and sends back what the participant did; the server alone decides the order of steps and
// items (so a reload, a second tab or an adaptive choice of the next item needs no page logic).

/** One option of a choice, as drawn on its side. */
export type PageOption = { side: 'left' | 'right'; option: 'sooner' | 'later'; amount: string; when: string };

/** A choice between a smaller-sooner and a larger-later reward. */
export type PageChoice = {
  itemId: string;
  /** calibration (first block) or probe (second block); the page shows no break between them */
  block: 'calibration' | 'probe';
  question: string;
  /** left option first */
  options: [PageOption, PageOption];
};

/** Real rewards: what the participant is paid for their drawn choice and when, and whether an address for the reward link is still needed. */
export type PageReward = { message: string; amount: string; currency: string; dueDate: string; needsDetails: boolean };

/** The completion screen: code and, when the link has one, where to go next (with the participant id); the reward when the study pays real rewards. */
export type PageCompletion = { code: string; redirectUrl: string | null; reward?: PageReward | null };

export type PageStep =
  | { kind: 'consent' }
  | { kind: 'instructions' }
  | { kind: 'choice'; choice: PageChoice; number: number; total: number }
  | { kind: 'complete'; completion: PageCompletion }
  | { kind: 'unavailable'; reason: 'paused' | 'closed' };

/** What the page shows about its link (no team-internal names). */
export type PageLink = { title: string; consentText: string; instructions: string; participantParam: string };

/** Every reply of the session page's API: the link, whose session, and the step to show. */
export type PageState = {
  link: PageLink;
  participantId: string;
  step: PageStep;
  /** set when the reply is not the step the page asked about (another tab moved on, a replay) */
  notice?: string;
  preview?: boolean;
};

/** The caution every session page carries. */
export const PAGE_CAUTION = 'This is a research study about choices between rewards. It is not a test or an assessment of you, and there are no right or wrong answers.';

/** One participant link as the operators' screen lists it, with its sessions counted by status and the failed attention checks. */
export type SessionLinkDto = {
  id: number;
  name: string;
  title: string;
  designVersionId: number;
  status: 'open' | 'paused' | 'closed';
  path: string;
  participantParam: string;
  consentText: string;
  instructions: string;
  completionCode: string;
  redirectUrl: string | null;
  createdAt: string;
  counts: Record<'started' | 'calibrated' | 'served' | 'completed' | 'abandoned', number>;
  /** participants who chose the dominated option of an attention check (calibration or stage 2) */
  attentionFailures: Array<{ participantId: string; checks: string[] }>;
};
