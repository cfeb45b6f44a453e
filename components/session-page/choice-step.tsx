'use client';

import { useEffect, useRef, useState } from 'react';
import type { PageChoice, PageOption } from '@/lib/shared/session-page';

/** The keys that choose an option, besides clicking or tapping it. */
const LEFT_KEYS = new Set(['ArrowLeft', 'f', 'F']);
const RIGHT_KEYS = new Set(['ArrowRight', 'j', 'J']);
/** A new question takes no answer for this long, so a double click cannot answer it too. */
const SETTLE_MS = 300;

/**
 * One choice: the question, the two options side by side (left as the bank chose), progress, and
 * the keys ← / F and → / J. Focus moves to the question when it appears, so screen readers
 * announce it and the keys work at once.
 */
export function ChoiceStep({ choice, number, total, pending, onChoose }: { choice: PageChoice; number: number; total: number; pending: boolean; onChoose: (option: PageOption, responseTimeMs: number) => void }) {
  const shownAt = useRef(0);
  const heading = useRef<HTMLHeadingElement>(null);
  const [settled, setSettled] = useState(false);
  useEffect(() => {
    shownAt.current = performance.now();
    heading.current?.focus();
    const timer = window.setTimeout(() => setSettled(true), SETTLE_MS);
    return () => window.clearTimeout(timer);
  }, []);
  const ready = settled && !pending;
  useEffect(() => {
    const onKey = (event: KeyboardEvent) => {
      if (event.ctrlKey || event.metaKey || event.altKey || !ready) return;
      const option = LEFT_KEYS.has(event.key) ? choice.options[0] : RIGHT_KEYS.has(event.key) ? choice.options[1] : null;
      if (!option) return;
      event.preventDefault();
      onChoose(option, Math.round(performance.now() - shownAt.current));
    };
    window.addEventListener('keydown', onKey);
    return () => window.removeEventListener('keydown', onKey);
  }, [choice, ready, onChoose]);
  const percent = Math.round(((number - 1) / Math.max(total, 1)) * 100);
  return (
    <div className="space-y-6" data-testid="choice-step" data-item-id={choice.itemId}>
      <div>
        <p className="text-sm text-ink-soft" data-testid="choice-progress">
          Question {number} of {total}
        </p>
        <div className="mt-1 h-2 w-full overflow-hidden rounded bg-paper-sunk" role="progressbar" aria-label="Progress" aria-valuemin={0} aria-valuemax={100} aria-valuenow={percent}>
          <div className="h-full bg-teal-600" style={{ width: `${percent}%` }} />
        </div>
      </div>
      <h2 ref={heading} tabIndex={-1} className="text-xl font-semibold outline-none">
        {choice.question}
      </h2>
      <div className="grid grid-cols-2 gap-3" role="group" aria-label="Options">
        {choice.options.map((option) => (
          <button
            key={option.side}
            type="button"
            disabled={!ready}
            data-option={option.option}
            aria-keyshortcuts={option.side === 'left' ? 'ArrowLeft F' : 'ArrowRight J'}
            onClick={() => onChoose(option, Math.round(performance.now() - shownAt.current))}
            className="flex min-h-28 flex-col items-center justify-center gap-1 rounded-lg border-2 border-ink/15 bg-paper-raised px-2 py-4 text-center shadow-sm transition-colors hover:border-teal-500 focus-visible:border-teal-600 focus-visible:outline-none disabled:cursor-wait disabled:opacity-60"
          >
            <span className="break-words text-2xl font-semibold tabular-nums">{option.amount}</span>
            <span className="text-base text-ink-soft">{option.when}</span>
          </button>
        ))}
      </div>
      <p className="text-xs text-ink-soft">Keys: ← or F for the left option, → or J for the right option.</p>
    </div>
  );
}
