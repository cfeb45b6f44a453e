'use client';

import { Fragment, useState } from 'react';
import { buttonClass } from '@/components/ui/button';
import { Card } from '@/components/ui/card';
import { Notice } from '@/components/ui/notice';
import { QueryState } from '@/components/ui/query-state';
import { Table, Td, Th } from '@/components/ui/table';
import { useStudyContext } from '@/components/studies/study-context';
import { useFrozenVersions, useParticipants, type ParticipantDto } from '@/lib/client/item-bank';
import { formatDateTime } from '@/lib/shared/format';
import { BatchUpload } from './batch-upload';
import { EstimateResolutionNote } from './estimate-resolution-note';
import { ItemTable } from './item-table';
import { SessionsCard } from './sessions-card';
import { TermHelp } from '@/components/glossary/term-help';

/** A rate with the standard error of its logarithm, named with the rate's own symbol (k small reward, K large). */
const rate = (r: ParticipantDto['kSmall'], symbol: 'k' | 'K') => `${r.rate.toPrecision(3)}${r.standardErrorLog !== null ? ` (SE ln ${symbol} ${r.standardErrorLog.toFixed(2)})` : ''}`;

/** Participants served through the API or a batch: estimates, flags, items; export and batch upload. */
export function ParticipantsPage() {
  const { study, can } = useStudyContext();
  const participants = useParticipants(study.id);
  const [open, setOpen] = useState<number | null>(null);
  return (
    <div className="space-y-6">
      <Notice title="Estimates, not assessments">
        These rates are estimates from hypothetical choices in a short calibration block. They describe choices in this study, are not a clinical assessment of
        anyone, and are not a diagnostic test; follow your ethics board&apos;s rules on how they may be used.
      </Notice>
      <SessionsCard studyId={study.id} canOperate={can('operator')} />
      <Card
        title="Participants served"
        actions={
          <a className={buttonClass('secondary', 'sm')} href={`/api/studies/${study.id}/participants?format=csv`} download>
            Export CSV
          </a>
        }
      >
        <QueryState query={participants} label="Loading participants…">
          {participants.data?.length ? (
            <>
            <EstimateResolutionNote />
            <Table caption="Participants served">
              <thead className="bg-paper-sunk">
                <tr>
                  <Th>Participant</Th>
                  <Th>
                    <TermHelp id="estimate">k, small reward</TermHelp> (per day)
                  </Th>
                  <Th>K, large reward (per day)</Th>
                  <Th>Items</Th>
                  <Th>Via</Th>
                  <Th>Served</Th>
                </tr>
              </thead>
              <tbody className="divide-y divide-ink/10">
                {participants.data.map((p) => (
                  <Fragment key={p.id}>
                    <tr data-testid="participant-row">
                      <Td>
                        <button type="button" className="font-mono text-xs text-teal-700 underline" onClick={() => setOpen(open === p.id ? null : p.id)}>
                          {p.participantId}
                        </button>
                      </Td>
                      <Td className="tabular-nums">{rate(p.kSmall, 'k')}</Td>
                      <Td className="tabular-nums">{rate(p.kLarge, 'K')}</Td>
                      <Td>
                        {p.itemSet}
                        {p.flag ? <span className="ml-1 rounded bg-amber-50 px-1 text-xs text-amber-700">{p.flag}</span> : null}
                        {p.extrapolation ? <span className="ml-1 rounded bg-amber-50 px-1 text-xs text-amber-700">extrapolates</span> : null}
                      </Td>
                      <Td>{p.source === 'api' ? 'API' : 'batch'}</Td>
                      <Td>{formatDateTime(p.servedAt)}</Td>
                    </tr>
                    {open === p.id ? (
                      <tr>
                        <td colSpan={6} className="bg-paper-sunk p-3">
                          {p.extrapolation ? <p className="mb-2 text-xs text-amber-700">{p.extrapolation}</p> : null}
                          <ItemTable items={p.items} caption={`Items served to ${p.participantId}`} />
                        </td>
                      </tr>
                    ) : null}
                  </Fragment>
                ))}
              </tbody>
            </Table>
            </>
          ) : (
            <p className="text-sm text-ink-soft">Nobody has been served yet. Participants appear here when your software calls the probe-items API or after a batch upload.</p>
          )}
        </QueryState>
      </Card>
      {can('operator') ? <BatchCard studyId={study.id} /> : null}
    </div>
  );
}

function BatchCard({ studyId }: { studyId: number }) {
  const versions = useFrozenVersions(studyId);
  return (
    <Card title="Batch: answers collected offline">
      <QueryState query={versions} label="Loading frozen versions…">
        {versions.data?.length ? <BatchUpload studyId={studyId} versions={versions.data} /> : <Notice>Freeze a design first.</Notice>}
      </QueryState>
    </Card>
  );
}
