'use client';

import { useMemo, useState } from 'react';
import { Button, buttonClass } from '@/components/ui/button';
import { Card } from '@/components/ui/card';
import { ProblemNotice } from '@/components/ui/notice';
import { QueryState } from '@/components/ui/query-state';
import { Table, Td, Th } from '@/components/ui/table';
import { useStudyContext } from '@/components/studies/study-context';
import { ApiClientError } from '@/lib/client/api';
import { payoutQuery, usePayoutAction, usePayouts, type PayoutDto, type PayoutFilter } from '@/lib/client/payouts';
import { formatDate, formatDateTime } from '@/lib/shared/format';
import { PAYOUT_STATUS_FILTERS } from '@/lib/shared/validations/payouts';

const box = 'rounded-md border border-ink/20 bg-paper-raised px-2 py-1.5 text-sm';
const STATUS_TONE: Record<string, string> = {
  scheduled: 'bg-teal-50 text-teal-700',
  held: 'bg-amber-50 text-amber-700',
  sending: 'bg-teal-50 text-teal-700',
  sent: 'bg-paper-sunk text-ink',
  failed: 'bg-danger-50 text-danger-700',
  cancelled: 'bg-paper-sunk text-ink-soft',
};

function Status({ payout }: { payout: PayoutDto }) {
  return <span className={`rounded px-1.5 py-0.5 text-xs font-medium ${STATUS_TONE[payout.status]}`}>{payout.status}</span>;
}

function problemOf(error: unknown) {
  return error instanceof ApiClientError ? { message: error.message, issues: error.issues } : null;
}

/** The study's payout ledger: filters, totals, CSV, and for owners the approval and cancellation of a batch. */
export function PayoutLedger() {
  const { study, can } = useStudyContext();
  const [filter, setFilter] = useState<PayoutFilter>({});
  const query = usePayouts(study.id, filter);
  const approve = usePayoutAction(study.id, 'approve');
  const cancel = usePayoutAction(study.id, 'cancel');
  const [selected, setSelected] = useState<Set<number>>(new Set());
  const [reason, setReason] = useState('');
  const payouts = useMemo(() => query.data?.payouts ?? [], [query.data]);
  const owner = can('owner');
  const set = (key: keyof PayoutFilter, value: string) => setFilter((f) => ({ ...f, [key]: value || undefined }));
  const toggle = (id: number) =>
    setSelected((s) => {
      const next = new Set(s);
      if (next.has(id)) next.delete(id);
      else next.add(id);
      return next;
    });
  const ids = payouts.filter((p) => selected.has(p.id)).map((p) => p.id);
  const done = () => setSelected(new Set());
  const failure = problemOf(approve.error) ?? problemOf(cancel.error);

  return (
    <Card
      title="Payout ledger"
      actions={
        <a href={`/api/studies/${study.id}/payouts?${payoutQuery(filter, 'csv')}`} className={buttonClass('secondary', 'sm')} download data-testid="payouts-csv">
          Download CSV
        </a>
      }
    >
      <div className="space-y-3">
        <div className="flex flex-wrap items-end gap-3">
          <label className="text-sm">
            <span className="block text-xs font-medium text-ink-soft">Status</span>
            <select className={box} value={filter.status ?? ''} onChange={(e) => set('status', e.target.value)} aria-label="Status">
              <option value="">Every status</option>
              {PAYOUT_STATUS_FILTERS.map((s) => (
                <option key={s} value={s}>
                  {s}
                </option>
              ))}
            </select>
          </label>
          <label className="text-sm">
            <span className="block text-xs font-medium text-ink-soft">Participant contains</span>
            <input className={box} type="search" value={filter.participant ?? ''} onChange={(e) => set('participant', e.target.value)} aria-label="Participant contains" />
          </label>
          <label className="text-sm">
            <span className="block text-xs font-medium text-ink-soft">Due from</span>
            <input className={box} type="date" value={filter.dueFrom ?? ''} onChange={(e) => set('dueFrom', e.target.value)} aria-label="Due from" />
          </label>
          <label className="text-sm">
            <span className="block text-xs font-medium text-ink-soft">Due to</span>
            <input className={box} type="date" value={filter.dueTo ?? ''} onChange={(e) => set('dueTo', e.target.value)} aria-label="Due to" />
          </label>
        </div>
        <QueryState query={query} label="Loading the ledger…">
          <p className="text-sm" data-testid="payout-totals">
            {Object.entries(query.data?.totals ?? {}).flatMap(([currency, byStatus]) =>
              Object.entries(byStatus).map(([status, t]) => (
                <span key={`${currency}:${status}`} className="mr-4 whitespace-nowrap">
                  {status}: {t.count} · {currency} {t.amount}
                </span>
              )),
            )}
            {payouts.length === 0 ? 'No payouts match. A payout appears when a participant of a version with real rewards completes their session.' : null}
          </p>
          {owner && payouts.length > 0 ? (
            <div className="flex flex-wrap items-end gap-2 text-sm">
              <span className="text-ink-soft">{ids.length} selected:</span>
              <Button size="sm" disabled={ids.length === 0 || approve.isPending} onClick={() => approve.mutate({ ids }, { onSuccess: done })}>
                Approve
              </Button>
              <input className={box + ' w-64'} placeholder="Why cancel (recorded)" value={reason} onChange={(e) => setReason(e.target.value)} aria-label="Reason for cancelling" />
              <Button size="sm" variant="danger" disabled={ids.length === 0 || cancel.isPending} onClick={() => cancel.mutate({ ids, reason }, { onSuccess: done })}>
                Cancel payouts
              </Button>
            </div>
          ) : null}
          {failure ? <ProblemNotice title="Not done" problem={failure} testId="payout-action-issues" /> : null}
          {payouts.length > 0 ? (
            <Table caption="Payouts">
              <thead className="bg-paper-sunk">
                <tr>
                  {owner ? <Th>Select</Th> : null}
                  <Th>Participant</Th>
                  <Th>Item drawn</Th>
                  <Th>Chosen</Th>
                  <Th className="text-right">Amount</Th>
                  <Th>Due</Th>
                  <Th>Status</Th>
                  <Th>Reason</Th>
                  <Th>Provider reference</Th>
                </tr>
              </thead>
              <tbody>
                {payouts.map((p) => (
                  <tr key={p.id} data-testid="payout-row">
                    {owner ? (
                      <Td>
                        <input type="checkbox" checked={selected.has(p.id)} onChange={() => toggle(p.id)} aria-label={`Select the payout of ${p.participantId}`} />
                      </Td>
                    ) : null}
                    <Td className="font-mono text-xs">{p.participantId}</Td>
                    <Td className="text-xs">
                      {p.itemId} <span className="text-ink-soft">({p.itemBlock}, 1 of {p.eligibleCount}, seed {p.seed})</span>
                    </Td>
                    <Td>{p.chosen === 'sooner' ? 'smaller-sooner' : 'larger-later'}</Td>
                    <Td className="whitespace-nowrap text-right tabular-nums">
                      {p.currency} {p.amount}
                      {p.amount !== p.chosenAmount ? <span className="block text-xs text-ink-soft">capped from {p.chosenAmount}</span> : null}
                    </Td>
                    <Td className="whitespace-nowrap">{formatDate(p.dueDate)}</Td>
                    <Td>
                      <Status payout={p} />
                      {p.needsApproval && p.status !== 'cancelled' ? <span className="block text-xs text-ink-soft">{p.approvedAt ? 'approved' : 'needs approval'}</span> : null}
                    </Td>
                    <Td className="max-w-xs text-xs [overflow-wrap:anywhere]">
                      {p.reason ?? ''}
                      {p.attempts > 0 ? <span className="block text-ink-soft">attempts: {p.attempts}{p.nextAttemptAt ? `, next ${formatDateTime(p.nextAttemptAt)}` : ''}</span> : null}
                    </Td>
                    <Td className="font-mono text-xs">{p.providerReference ?? '—'}</Td>
                  </tr>
                ))}
              </tbody>
            </Table>
          ) : null}
        </QueryState>
      </div>
    </Card>
  );
}
