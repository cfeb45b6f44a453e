'use client';

import { useState } from 'react';
import { useStudyContext } from '@/components/studies/study-context';
import { Button } from '@/components/ui/button';
import { Card } from '@/components/ui/card';
import { Notice } from '@/components/ui/notice';
import { QueryState } from '@/components/ui/query-state';
import { useDeletePrior, usePriors } from '@/lib/client/planner';
import { fmtRate } from '@/lib/shared/planner/format';
import { EstimateCaution } from './estimate-caution';
import { PriorForm } from './prior-form';

/** The study's prior sets: a list to pick from, and the form with its live chart. */
export function PriorsPage() {
  const { study, can } = useStudyContext();
  const priors = usePriors(study.id);
  const remove = useDeletePrior(study.id);
  const [selected, setSelected] = useState<number | 'new' | null>(null);
  const canEdit = can('editor');
  const list = priors.data ?? [];
  const current = selected === 'new' ? null : (list.find((p) => p.id === selected) ?? (selected === null ? (list[0] ?? null) : null));
  const showForm = selected === 'new' || current !== null;

  return (
    <div className="grid gap-6 lg:grid-cols-3">
      <div className="space-y-4">
        <Card title="Prior sets" actions={canEdit ? <Button size="sm" onClick={() => setSelected('new')}>New prior set</Button> : null}>
          <QueryState query={priors} label="Loading prior sets…">
            {list.length === 0 ? <p className="text-sm text-ink-soft">No prior sets yet.</p> : null}
            <ul className="divide-y divide-ink/10">
              {list.map((p) => (
                <li key={p.id} className="py-2">
                  <button type="button" className={`w-full text-left ${current?.id === p.id ? 'font-semibold text-teal-700' : ''}`} onClick={() => setSelected(p.id)} data-testid="prior-item">
                    {p.name}
                  </button>
                  <p className="text-xs text-ink-soft">
                    median k {fmtRate(p.values.medianSmall)}, K {fmtRate(p.values.medianLarge)} per day · {p.source === 'pilot' ? 'from pilot data' : 'set by hand'}
                  </p>
                </li>
              ))}
            </ul>
          </QueryState>
        </Card>
        <EstimateCaution />
      </div>
      <div className="lg:col-span-2">
        <Card
          title={selected === 'new' ? 'New prior set' : (current?.name ?? 'Prior set')}
          actions={
            canEdit && current ? (
              <Button size="sm" variant="secondary" onClick={() => remove.mutate(current.id, { onSuccess: () => setSelected(null) })}>
                Delete
              </Button>
            ) : null
          }
        >
          {remove.error ? <Notice tone="error">{remove.error.message}</Notice> : null}
          {showForm ? (
            <PriorForm key={current?.id ?? 'new'} studyId={study.id} prior={current} canEdit={canEdit} onSaved={(p) => setSelected(p.id)} />
          ) : (
            <p className="text-sm text-ink-soft">{canEdit ? 'Create a prior set to start planning.' : 'No prior set to show yet.'}</p>
          )}
        </Card>
      </div>
    </div>
  );
}
