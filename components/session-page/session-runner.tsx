'use client';

import { useCallback, useEffect, useRef, useState } from 'react';
import { Notice, ProblemNotice, type Problem } from '@/components/ui/notice';
import type { PageCall, PageDriver } from '@/lib/client/session-page';
import type { PageOption, PageState } from '@/lib/shared/session-page';
import { ChoiceStep } from './choice-step';
import { CompletionStep } from './completion-step';
import { ConsentStep, InstructionsStep } from './intro-steps';

/** How often a step is retried after a lost connection or a busy server before the page asks for a reload. */
const MAX_RETRIES = 60;
const sleep = (ms: number) => new Promise((resolve) => setTimeout(resolve, ms));

/**
 * Runs a session page: shows whatever step the server says the participant is on and sends back
 * what they did. A lost connection is retried with the same request (answers are idempotent per
 * item); a refused step (another tab moved on, a changed answer) shows the step the server names.
 */
export function SessionRunner({ driver, preview = false }: { driver: PageDriver; preview?: boolean }) {
  const [state, setState] = useState<PageState | null>(null);
  const [notice, setNotice] = useState<string | null>(null);
  const [problem, setProblem] = useState<Problem | null>(null);
  const [pending, setPending] = useState(false);
  const busy = useRef(false);

  const run = useCallback(async (send: () => Promise<PageCall>) => {
    if (busy.current) return; // one step at a time: a second click while one is on its way is dropped
    busy.current = true;
    setPending(true);
    for (let attempt = 0; ; attempt++) {
      const result = await send();
      if (result.ok) {
        setState(result.state);
        setNotice(result.notice ?? null);
        setProblem(null);
        break;
      }
      if (result.retryAfterMs !== undefined && attempt < MAX_RETRIES) {
        setProblem({ message: result.status === 0 ? result.message : 'The server is busy; retrying…', issues: [] });
        await sleep(result.retryAfterMs);
        continue;
      }
      if (result.state) {
        setState(result.state);
        setNotice(result.state.notice ?? result.message);
        setProblem(null);
      } else {
        setProblem({ message: result.message, issues: result.issues });
      }
      break;
    }
    busy.current = false;
    setPending(false);
  }, []);

  useEffect(() => {
    // from a timer, not the effect's body: the load sets state when its reply comes
    const timer = setTimeout(() => void run(driver.load), 0);
    // a tab brought back to the front asks where the session is now (another tab may have moved it on)
    const onVisible = () => {
      if (document.visibilityState === 'visible') void run(driver.load);
    };
    document.addEventListener('visibilitychange', onVisible);
    return () => {
      clearTimeout(timer);
      document.removeEventListener('visibilitychange', onVisible);
    };
  }, [driver, run]);

  const choose = useCallback(
    (option: PageOption, responseTimeMs: number) => {
      if (!state || state.step.kind !== 'choice') return;
      const { choice } = state.step;
      const sideShown = choice.options.find((o) => o.option === 'sooner')!.side;
      void run(() => driver.act({ action: 'answer', participantId: state.participantId, itemId: choice.itemId, chosen: option.option, responseTimeMs, sideShown }, choice.block));
    },
    [driver, run, state],
  );

  if (!state) {
    return problem ? <ProblemNotice title="This study cannot be opened" problem={problem} testId="page-issues" /> : <p className="text-ink-soft">Loading…</p>;
  }
  const { step, link, participantId } = state;
  return (
    <div className="space-y-4">
      <h1 className="text-2xl font-semibold break-words">{link.title}</h1>
      {notice ? <Notice tone="info">{notice}</Notice> : null}
      {problem ? <ProblemNotice title="Not saved yet" problem={problem} testId="page-issues" /> : null}
      {step.kind === 'consent' ? <ConsentStep link={link} pending={pending} onAgree={() => void run(() => driver.act({ action: 'consent', participantId, agree: true }, null))} /> : null}
      {step.kind === 'instructions' ? <InstructionsStep link={link} pending={pending} onBegin={() => void run(() => driver.act({ action: 'begin', participantId }, null))} /> : null}
      {step.kind === 'choice' ? <ChoiceStep key={step.choice.itemId} choice={step.choice} number={step.number} total={step.total} pending={pending} onChoose={choose} /> : null}
      {step.kind === 'complete' ? (
        <CompletionStep
          completion={step.completion}
          preview={preview}
          pending={pending}
          onPaymentDetails={preview ? undefined : (email) => void run(() => driver.act({ action: 'payment-details', participantId, email }, null))}
        />
      ) : null}
      {step.kind === 'unavailable' ? (
        <div data-testid="unavailable-step">
          <Notice tone="warning" title={step.reason === 'paused' ? 'This study is paused' : 'This study is closed'}>
            {step.reason === 'paused'
              ? 'The research team has paused this study for now. Your answers so far are saved; please open the same link again later to continue.'
              : 'This study no longer takes part in new answers. Thank you for your interest.'}
          </Notice>
        </div>
      ) : null}
    </div>
  );
}
