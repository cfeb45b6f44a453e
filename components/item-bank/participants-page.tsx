'use client';

import { Fragment, useCallback, useState } from 'react';
import { usePathname, useRouter, useSearchParams } from 'next/navigation';
import { buttonClass } from '@/components/ui/button';
import { Card } from '@/components/ui/card';
import { Notice } from '@/components/ui/notice';
import { QueryState } from '@/components/ui/query-state';
import { Table, Td, Th } from '@/components/ui/table';
import { useStudyContext } from '@/components/studies/study-context';
import { TermHelp } from '@/components/glossary/term-help';
import { participantsSearch, useFrozenVersions, useParticipantPage, type FrozenVersionDto, type ParticipantDto, type ParticipantRowDto } from '@/lib/client/item-bank';
import { formatDateTime } from '@/lib/shared/format';
import { readParticipantsQuery, type ParticipantsQuery } from '@/lib/shared/validations/session';
import { BatchUpload } from './batch-upload';
import { EstimateResolutionNote } from './estimate-resolution-note';
import { ItemTable } from './item-table';
import { ParticipantFilters, ParticipantPager } from './participant-filters';
import { SessionIdleTime } from './sessions-card';

/** A rate with the standard error of its logarithm, named with the rate's own symbol (k small reward, K large). */
const rate = (r: ParticipantDto['kSmall'], symbol: 'k' | 'K') => `${r.rate.toPrecision(3)}${r.standardErrorLog !== null ? ` (SE ln ${symbol} ${r.standardErrorLog.toFixed(2)})` : ''}`;

/** The study's participants: search, status and version filters, pages, estimates, items; exports of what is filtered, and batch upload. */
export function ParticipantsPage() {
  const { study, can } = useStudyContext();
  const versions = useFrozenVersions(study.id);
  return (
    <div className="space-y-6">
      <Notice title="Estimates, not assessments">
        These rates are estimates from hypothetical choices in a short calibration block. They describe choices in this study, are not a clinical assessment of
        anyone, and are not a diagnostic test; follow your ethics board&apos;s rules on how they may be used. Every export carries this caution in its last column.
      </Notice>
      <ParticipantList studyId={study.id} versions={versions.data ?? []} canOperate={can('operator')} />
      {can('operator') ? (
        <Card title="Batch: answers collected offline">
          <QueryState query={versions} label="Loading frozen versions…">
            {versions.data?.length ? <BatchUpload studyId={study.id} versions={versions.data} /> : <Notice>Freeze a design first.</Notice>}
          </QueryState>
        </Card>
      ) : null}
    </div>
  );
}

/** The list's state lives in the address (?q=, ?status=, ?version=, ?page=, ?pageSize=), so a filtered page can be linked. */
function useListAddress() {
  const params = useSearchParams();
  const router = useRouter();
  const pathname = usePathname();
  const { query, ignored } = readParticipantsQuery(new URLSearchParams(params.toString()));
  const change = useCallback(
    (next: Partial<ParticipantsQuery>) => {
      const merged = { ...readParticipantsQuery(new URLSearchParams(params.toString())).query, ...next };
      const search = participantsSearch(merged);
      router.replace(search ? `${pathname}?${search}` : pathname, { scroll: false });
    },
    [params, pathname, router],
  );
  return { query, ignored, change };
}

function ParticipantList({ studyId, versions, canOperate }: { studyId: number; versions: FrozenVersionDto[]; canOperate: boolean }) {
  const { query, ignored, change } = useListAddress();
  const list = useParticipantPage(studyId, query);
  const exportSearch = participantsSearch(query, { csv: true });
  return (
    <Card
      title="Participants"
      actions={
        <div className="flex flex-wrap gap-2">
          <a className={buttonClass('secondary', 'sm')} href={`/api/studies/${studyId}/participants?${exportSearch}`} download data-testid="export-participants">
            Export CSV (as filtered)
          </a>
          <a className={buttonClass('secondary', 'sm')} href={`/api/studies/${studyId}/sessions?${exportSearch}`} download>
            Export sessions CSV
          </a>
        </div>
      }
    >
      <div className="space-y-4">
        {ignored.length ? (
          <Notice tone="warning" title="Part of this link was not understood">
            Ignored {ignored.join(', ')}: showing the list with {ignored.length === 1 ? 'its default' : 'their defaults'} instead.
          </Notice>
        ) : null}
        <ParticipantFilters query={query} counts={list.data?.counts} versions={versions} onChange={change} />
        <QueryState query={list} label="Loading participants…">
          {list.data ? (
            <>
              <p className="text-xs text-ink-soft">A session that is not completed reads as abandoned after {list.data.idleMinutes} minutes without activity.</p>
              {list.data.participants.length ? <EstimateResolutionNote /> : null}
              {list.data.participants.length ? <ParticipantTable rows={list.data.participants} /> : <EmptyList filtered={!!(query.q || query.status || query.version)} />}
              <ParticipantPager query={query} total={list.data.total} page={list.data.page} pageCount={list.data.pageCount} onChange={change} />
              {canOperate ? <SessionIdleTime studyId={studyId} current={list.data.idleMinutes} /> : null}
            </>
          ) : null}
        </QueryState>
      </div>
    </Card>
  );
}

function EmptyList({ filtered }: { filtered: boolean }) {
  return (
    <p className="text-sm text-ink-soft">
      {filtered
        ? 'Nobody matches these filters.'
        : 'Nobody has started yet. Participants appear here when your software calls the session API or the probe-items API, or after a batch upload.'}
    </p>
  );
}

function ParticipantTable({ rows }: { rows: ParticipantRowDto[] }) {
  const [open, setOpen] = useState<string | null>(null);
  return (
    <Table caption="Participants">
      <thead className="bg-paper-sunk">
        <tr>
          <Th>Participant</Th>
          <Th>Status</Th>
          <Th>Stage-2 answers</Th>
          <Th>
            <TermHelp id="estimate">k, small reward</TermHelp> (per day)
          </Th>
          <Th>K, large reward (per day)</Th>
          <Th>Items</Th>
          <Th>Via</Th>
          <Th>Last activity</Th>
        </tr>
      </thead>
      <tbody className="divide-y divide-ink/10">
        {rows.map((r) => (
          <Fragment key={r.participantId}>
            <tr data-testid="participant-row">
              <Td>
                {r.served ? (
                  <button type="button" className="font-mono text-xs text-teal-700 underline" aria-expanded={open === r.participantId} onClick={() => setOpen(open === r.participantId ? null : r.participantId)}>
                    {r.participantId}
                  </button>
                ) : (
                  <span className="font-mono text-xs">{r.participantId}</span>
                )}
              </Td>
              <Td>{r.status}</Td>
              <Td className="tabular-nums">{r.itemCount ? `${r.answered} of ${r.itemCount}` : '—'}</Td>
              <Td className="tabular-nums">{r.served ? rate(r.served.kSmall, 'k') : '—'}</Td>
              <Td className="tabular-nums">{r.served ? rate(r.served.kLarge, 'K') : '—'}</Td>
              <Td>
                {r.served ? r.served.itemSet : '—'}
                {r.served?.flag ? <span className="ml-1 rounded bg-amber-50 px-1 text-xs text-amber-700">{r.served.flag}</span> : null}
                {r.served?.extrapolation ? <span className="ml-1 rounded bg-amber-50 px-1 text-xs text-amber-700">extrapolates</span> : null}
              </Td>
              <Td>{r.source === 'api' ? 'API' : r.source}</Td>
              <Td>{formatDateTime(r.lastActivityAt)}</Td>
            </tr>
            {open === r.participantId && r.served ? (
              <tr>
                <td colSpan={8} className="bg-paper-sunk p-3">
                  {r.served.extrapolation ? <p className="mb-2 text-xs text-amber-700">{r.served.extrapolation}</p> : null}
                  <ItemTable items={r.served.items} caption={`Items served to ${r.participantId}`} />
                </td>
              </tr>
            ) : null}
          </Fragment>
        ))}
      </tbody>
    </Table>
  );
}
