'use client';

import { useEffect, useState } from 'react';
import { Button } from '@/components/ui/button';
import { SelectField, TextField } from '@/components/ui/field';
import type { FrozenVersionDto, SessionStatusDto } from '@/lib/client/item-bank';
import { PARTICIPANT_PAGE_SIZES, SESSION_STATUS_VALUES, type ParticipantsQuery } from '@/lib/shared/validations/session';

type Props = {
  query: ParticipantsQuery;
  counts: Record<SessionStatusDto, number> | undefined;
  versions: FrozenVersionDto[];
  onChange: (change: Partial<ParticipantsQuery>) => void;
};

/** Search by participant id, status buttons with their counts, and the frozen version; every change starts again at page 1. */
export function ParticipantFilters({ query, counts, versions, onChange }: Props) {
  const [text, setText] = useState(query.q ?? '');
  // the address is the list's state: follow it when it changes from outside (back button, a link)
  const [seen, setSeen] = useState(query.q);
  if (seen !== query.q) {
    setSeen(query.q);
    if ((query.q ?? '') !== text.trim()) setText(query.q ?? '');
  }
  // ask the server once typing pauses, not on every keystroke
  useEffect(() => {
    if (text.trim() === (query.q ?? '')) return;
    const timer = setTimeout(() => onChange({ q: text.trim() || undefined, page: 1 }), 300);
    return () => clearTimeout(timer);
  }, [text, query.q, onChange]);
  const total = counts ? Object.values(counts).reduce((a, b) => a + b, 0) : undefined;
  return (
    <div className="space-y-3">
      <div className="grid gap-3 sm:grid-cols-2">
        <TextField label="Search participant ids" type="search" value={text} maxLength={128} placeholder="part of an id, e.g. HL-0" onChange={(e) => setText(e.target.value)} data-testid="participant-search" />
        <SelectField label="Frozen version" value={query.version ?? ''} onChange={(e) => onChange({ version: e.target.value ? Number(e.target.value) : undefined, page: 1 })} data-testid="participant-version">
          <option value="">all versions</option>
          {versions.map((v) => (
            <option key={v.id} value={v.id}>
              {v.designName} · v{v.number}
            </option>
          ))}
        </SelectField>
      </div>
      <div className="flex flex-wrap gap-2" role="group" aria-label="Filter participants by session status">
        <Button size="sm" variant={query.status ? 'secondary' : 'primary'} aria-pressed={!query.status} onClick={() => onChange({ status: undefined, page: 1 })} data-testid="session-count-all">
          all{total !== undefined ? ` ${total}` : ''}
        </Button>
        {SESSION_STATUS_VALUES.map((s) => (
          <Button key={s} size="sm" variant={query.status === s ? 'primary' : 'secondary'} aria-pressed={query.status === s} onClick={() => onChange({ status: s, page: 1 })} data-testid={`session-count-${s}`}>
            {s}
            {counts ? ` ${counts[s]}` : ''}
          </Button>
        ))}
      </div>
    </div>
  );
}

/** "21–40 of 73", the page size, and previous / next. */
export function ParticipantPager({ query, total, page, pageCount, onChange }: { query: ParticipantsQuery; total: number; page: number; pageCount: number; onChange: (change: Partial<ParticipantsQuery>) => void }) {
  const first = total === 0 ? 0 : (page - 1) * query.pageSize + 1;
  const last = Math.min(total, page * query.pageSize);
  return (
    <nav className="flex flex-wrap items-end justify-between gap-3" aria-label="Participant pages">
      <p className="text-sm text-ink-soft" data-testid="participant-range" aria-live="polite">
        {total === 0 ? 'No participants match.' : `${first}–${last} of ${total} · page ${page} of ${pageCount}`}
      </p>
      <div className="flex flex-wrap items-end gap-2">
        <div className="w-32">
          <SelectField label="Per page" value={query.pageSize} onChange={(e) => onChange({ pageSize: Number(e.target.value), page: 1 })} data-testid="participant-page-size">
            {PARTICIPANT_PAGE_SIZES.map((n) => (
              <option key={n} value={n}>
                {n}
              </option>
            ))}
          </SelectField>
        </div>
        <Button size="sm" variant="secondary" disabled={page <= 1} onClick={() => onChange({ page: page - 1 })}>
          Previous
        </Button>
        <Button size="sm" variant="secondary" disabled={page >= pageCount} onClick={() => onChange({ page: page + 1 })}>
          Next
        </Button>
      </div>
    </nav>
  );
}
