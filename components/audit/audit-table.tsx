'use client';

import {
  createColumnHelper,
  flexRender,
  getCoreRowModel,
  getFilteredRowModel,
  getPaginationRowModel,
  getSortedRowModel,
  useReactTable,
  type ColumnFiltersState,
  type SortingState,
} from '@tanstack/react-table';
import Link from 'next/link';
import { Fragment, useMemo, useState } from 'react';
import { buttonClass } from '@/components/ui/button';
import { Button } from '@/components/ui/button';
import { Card } from '@/components/ui/card';
import { QueryState } from '@/components/ui/query-state';
import { Table, Td, Th } from '@/components/ui/table';
import { useStudyContext } from '@/components/studies/study-context';
import { useAuditEvents, type AuditEventDto, type AuditNamesDto } from '@/lib/client/team';
import { formatDateTime } from '@/lib/shared/format';
import { describeAction, describeEvent, sentenceText, type SentencePart } from './describe';

const column = createColumnHelper<AuditEventDto>();

const NO_NAMES: AuditNamesDto = { designs: {}, versions: {}, priors: {}, users: {} };

function Sentence({ parts }: { parts: SentencePart[] }) {
  return (
    <span className="[overflow-wrap:anywhere]">
      {parts.map((p, i) =>
        typeof p === 'string' ? (
          <Fragment key={i}>{p}</Fragment>
        ) : (
          <Link key={i} href={p.href} className="text-teal-700 underline">
            {p.text}
          </Link>
        ),
      )}
    </span>
  );
}

function makeColumns(names: AuditNamesDto, studyId: number) {
  return [
    column.accessor('at', { header: 'When', cell: (c) => <span className="whitespace-nowrap">{formatDateTime(c.getValue())}</span>, enableColumnFilter: false }),
    column.accessor('action', { header: 'What', cell: (c) => <span title={c.getValue()}>{describeAction(c.getValue())}</span>, filterFn: 'equalsString' }),
    column.accessor((e) => e.actorName ?? e.actorEmail ?? 'a removed account', { id: 'actor', header: 'Who', filterFn: 'equalsString' }),
    column.accessor((e) => sentenceText(describeEvent(e, names, studyId)), {
      id: 'details',
      header: 'Details',
      enableSorting: false,
      cell: (c) => <Sentence parts={describeEvent(c.row.original, names, studyId)} />,
    }),
  ];
}

function SortMark({ state }: { state: false | 'asc' | 'desc' }) {
  return <span aria-hidden="true">{state === 'asc' ? ' ▲' : state === 'desc' ? ' ▼' : ''}</span>;
}

/** The study's audit trail: sortable columns, filters by action, person and text, and a CSV download. */
export function AuditTable() {
  const { study } = useStudyContext();
  const query = useAuditEvents(study.id);
  const events = useMemo(() => query.data?.events ?? [], [query.data]);
  const columns = useMemo(() => makeColumns(query.data?.names ?? NO_NAMES, study.id), [query.data, study.id]);
  const [sorting, setSorting] = useState<SortingState>([{ id: 'at', desc: true }]);
  const [columnFilters, setColumnFilters] = useState<ColumnFiltersState>([]);
  const [globalFilter, setGlobalFilter] = useState('');
  // eslint-disable-next-line react-hooks/incompatible-library -- the table object is used only in this component's render
  const table = useReactTable({
    data: events,
    columns,
    state: { sorting, columnFilters, globalFilter },
    onSortingChange: setSorting,
    onColumnFiltersChange: setColumnFilters,
    onGlobalFilterChange: setGlobalFilter,
    globalFilterFn: 'includesString',
    getCoreRowModel: getCoreRowModel(),
    getSortedRowModel: getSortedRowModel(),
    getFilteredRowModel: getFilteredRowModel(),
    getPaginationRowModel: getPaginationRowModel(),
    initialState: { pagination: { pageSize: 25 } },
  });
  const actions = useMemo(() => [...new Set(events.map((e) => e.action))].sort(), [events]);
  const actors = useMemo(() => [...new Set(events.map((e) => e.actorName ?? e.actorEmail ?? 'a removed account'))].sort(), [events]);
  const select = 'rounded-md border border-ink/20 bg-paper-raised px-2 py-1.5 text-sm';
  const shown = table.getFilteredRowModel().rows.length;

  return (
    <Card
      title="Audit trail"
      actions={
        <a href={`/api/studies/${study.id}/audit/csv`} className={buttonClass('secondary', 'sm')} download>
          Download CSV
        </a>
      }
    >
      <QueryState query={query} label="Loading the audit trail…">
        <div className="space-y-3">
          <div className="flex flex-wrap items-end gap-3">
            <label className="text-sm">
              <span className="block text-xs font-medium text-ink-soft">What</span>
              <select className={select} value={(table.getColumn('action')?.getFilterValue() as string) ?? ''} onChange={(e) => table.getColumn('action')?.setFilterValue(e.target.value || undefined)}>
                <option value="">Every action</option>
                {actions.map((a) => (
                  <option key={a} value={a}>
                    {describeAction(a)}
                  </option>
                ))}
              </select>
            </label>
            <label className="text-sm">
              <span className="block text-xs font-medium text-ink-soft">Who</span>
              <select className={select} value={(table.getColumn('actor')?.getFilterValue() as string) ?? ''} onChange={(e) => table.getColumn('actor')?.setFilterValue(e.target.value || undefined)}>
                <option value="">Everyone</option>
                {actors.map((a) => (
                  <option key={a} value={a}>
                    {a}
                  </option>
                ))}
              </select>
            </label>
            <label className="text-sm">
              <span className="block text-xs font-medium text-ink-soft">Contains</span>
              <input className={select} type="search" value={globalFilter} onChange={(e) => setGlobalFilter(e.target.value)} placeholder="e-mail, hash, role…" />
            </label>
            <p className="ml-auto text-xs text-ink-soft" data-testid="audit-count">
              {shown} of {events.length} events
            </p>
          </div>
          <Table caption="Audit events">
            <thead className="bg-paper-sunk">
              {table.getHeaderGroups().map((group) => (
                <tr key={group.id}>
                  {group.headers.map((header) => {
                    const sorted = header.column.getIsSorted();
                    return (
                      <Th key={header.id} aria-sort={sorted === 'asc' ? 'ascending' : sorted === 'desc' ? 'descending' : undefined}>
                        {header.column.getCanSort() ? (
                          <button type="button" className="hover:text-ink" onClick={header.column.getToggleSortingHandler()}>
                            {flexRender(header.column.columnDef.header, header.getContext())}
                            <SortMark state={sorted} />
                          </button>
                        ) : (
                          flexRender(header.column.columnDef.header, header.getContext())
                        )}
                      </Th>
                    );
                  })}
                </tr>
              ))}
            </thead>
            <tbody className="divide-y divide-ink/10">
              {table.getRowModel().rows.map((row) => (
                <tr key={row.id} data-testid="audit-row">
                  {row.getVisibleCells().map((cell) => (
                    <Td key={cell.id}>{flexRender(cell.column.columnDef.cell, cell.getContext())}</Td>
                  ))}
                </tr>
              ))}
              {shown === 0 ? (
                <tr>
                  <Td colSpan={4} className="text-ink-soft">
                    {events.length ? 'No event matches these filters.' : 'Nothing has been recorded yet.'}
                  </Td>
                </tr>
              ) : null}
            </tbody>
          </Table>
          {table.getPageCount() > 1 ? (
            <div className="flex items-center justify-end gap-2 text-sm">
              <Button size="sm" variant="secondary" onClick={() => table.previousPage()} disabled={!table.getCanPreviousPage()}>
                Newer
              </Button>
              <span className="text-ink-soft">
                Page {table.getState().pagination.pageIndex + 1} of {table.getPageCount()}
              </span>
              <Button size="sm" variant="secondary" onClick={() => table.nextPage()} disabled={!table.getCanNextPage()}>
                Older
              </Button>
            </div>
          ) : null}
          {query.data && events.length >= query.data.limit ? (
            <p className="text-xs text-ink-soft">Showing the newest {query.data.limit} events; the CSV holds the same set.</p>
          ) : null}
        </div>
      </QueryState>
    </Card>
  );
}
