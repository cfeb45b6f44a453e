'use client';

import Link from 'next/link';
import { useEffect, useId, useRef, useState, type ReactNode } from 'react';
import { glossaryEntry } from '@/lib/shared/glossary';

/**
 * A term with its one-line explanation. The small "?" button opens the explanation on click,
 * tap or keyboard (not on hover alone, which touch screens do not have); Escape or a click
 * elsewhere closes it. The explanation links to the term's entry on the glossary page.
 */
export function TermHelp({ id, children }: { id: string; children?: ReactNode }) {
  const entry = glossaryEntry(id);
  const [open, setOpen] = useState(false);
  // open towards the left when the button sits in the right part of the screen, so the panel never sticks out sideways
  const [alignRight, setAlignRight] = useState(false);
  const panelId = useId();
  const root = useRef<HTMLSpanElement>(null);
  useEffect(() => {
    if (!open) return;
    const onKey = (event: KeyboardEvent) => {
      if (event.key === 'Escape') setOpen(false);
    };
    const onPointer = (event: PointerEvent) => {
      if (root.current && !root.current.contains(event.target as Node)) setOpen(false);
    };
    document.addEventListener('keydown', onKey);
    document.addEventListener('pointerdown', onPointer);
    return () => {
      document.removeEventListener('keydown', onKey);
      document.removeEventListener('pointerdown', onPointer);
    };
  }, [open]);
  return (
    <span ref={root} className="relative inline">
      {children ?? entry.term}
      <button
        type="button"
        aria-expanded={open}
        aria-controls={panelId}
        aria-label={`What is “${entry.term}”?`}
        title={entry.short}
        onClick={(event) => {
          setAlignRight(event.currentTarget.getBoundingClientRect().left > window.innerWidth - 300);
          setOpen((o) => !o);
        }}
        className="ml-1 inline-flex h-4 w-4 translate-y-[-1px] items-center justify-center rounded-full border border-ink/30 align-middle text-[0.65rem] font-semibold normal-case leading-none text-ink-soft hover:border-teal-600 hover:text-teal-700 focus-visible:outline focus-visible:outline-2 focus-visible:outline-teal-600"
        data-testid={`help-${id}`}
      >
        ?
      </button>
      {open ? (
        <span
          id={panelId}
          role="note"
          className={`absolute ${alignRight ? 'right-0' : 'left-0'} top-full z-20 mt-1 block w-72 max-w-[calc(100vw-2rem)] rounded-md border border-ink/15 bg-paper-raised p-3 text-left text-xs font-normal normal-case leading-snug text-ink shadow-lg`}
          data-testid={`help-panel-${id}`}
        >
          <span className="block font-semibold">{entry.term}</span>
          <span className="mt-1 block">{entry.short}</span>
          <Link href={`/glossary#${entry.id}`} className="mt-1 block text-teal-700 underline">
            Formula and source
          </Link>
        </span>
      ) : null}
    </span>
  );
}
