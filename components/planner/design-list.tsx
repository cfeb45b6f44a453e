'use client';

import Link from 'next/link';
import { useRouter } from 'next/navigation';
import { useState } from 'react';
import { useStudyContext } from '@/components/studies/study-context';
import { Button, buttonClass } from '@/components/ui/button';
import { Card } from '@/components/ui/card';
import { SelectField, TextField } from '@/components/ui/field';
import { Notice } from '@/components/ui/notice';
import { QueryState } from '@/components/ui/query-state';
import { Table, Td, Th } from '@/components/ui/table';
import { ApiClientError } from '@/lib/client/api';
import { useCreateDesign, useDesigns, usePriors, useVersions } from '@/lib/client/planner';
import { defaultSpec } from '@/lib/shared/planner/design-form-values';
import { formatDateTime } from '@/lib/shared/format';
import { CRITERION_LABELS, MODEL_LABELS } from './labels';

/** The study's candidate designs: open one, pick two to four to compare, or start a new one. */
export function DesignList() {
  const { study, can } = useStudyContext();
  const router = useRouter();
  const designs = useDesigns(study.id);
  const priors = usePriors(study.id);
  const create = useCreateDesign(study.id);
  const versions = useVersions(study.id);
  const [picked, setPicked] = useState<number[]>([]);
  const [name, setName] = useState('');
  const [priorId, setPriorId] = useState<number | ''>('');
  const [nameError, setNameError] = useState<string | null>(null);
  const list = designs.data ?? [];
  const toggle = (id: number) => setPicked((p) => (p.includes(id) ? p.filter((x) => x !== id) : p.length < 4 ? [...p, id] : p));
  const chosenPrior = priorId === '' ? priors.data?.[0]?.id : priorId;

  async function onCreate(event: React.FormEvent) {
    event.preventDefault();
    setNameError(null);
    if (!name.trim()) return setNameError('Name the design.');
    if (!chosenPrior) return setNameError('Create a prior set first.');
    try {
      const design = await create.mutateAsync(defaultSpec(name.trim(), chosenPrior));
      router.push(`/studies/${study.id}/designs/${design.id}`);
    } catch (error) {
      setNameError(error instanceof ApiClientError ? (error.issues[0]?.message ?? error.message) : 'The design could not be created.');
    }
  }

  return (
    <div className="space-y-6">
      <Card
        title="Candidate designs"
        actions={
          <Link href={`/studies/${study.id}/compare?designs=${picked.join(',')}`} aria-disabled={picked.length < 2} className={`${buttonClass('secondary', 'sm')} ${picked.length < 2 ? 'pointer-events-none opacity-50' : ''}`}>
            Compare {picked.length ? `(${picked.length})` : ''}
          </Link>
        }
      >
        <QueryState query={designs} label="Loading designs…">
          {list.length === 0 ? (
            <p className="text-sm text-ink-soft">No designs yet.</p>
          ) : (
            <Table caption="Candidate designs">
              <thead className="bg-paper-sunk">
                <tr>
                  <Th>Compare</Th>
                  <Th>Design</Th>
                  <Th>Model</Th>
                  <Th>Type</Th>
                  <Th>Criterion</Th>
                  <Th>Status</Th>
                  <Th>Changed</Th>
                </tr>
              </thead>
              <tbody className="divide-y divide-ink/10">
                {list.map((d) => (
                  <tr key={d.id} data-testid="design-row">
                    <Td>
                      <input type="checkbox" aria-label={`Compare ${d.name}`} checked={picked.includes(d.id)} onChange={() => toggle(d.id)} />
                    </Td>
                    <Td>
                      <Link className="font-medium text-teal-700 underline" href={`/studies/${study.id}/designs/${d.id}`}>
                        {d.name}
                      </Link>
                    </Td>
                    <Td>{MODEL_LABELS[d.spec.model.id]}</Td>
                    <Td>{d.spec.mode === 'personalised' ? 'Personalised' : 'Population'}</Td>
                    <Td>{CRITERION_LABELS[d.spec.criterion]}</Td>
                    <Td>{d.frozen ? `Frozen (v${d.latestVersion?.number})` : d.latestVersion ? `Draft after v${d.latestVersion.number}` : 'Draft'}</Td>
                    <Td className="text-ink-soft">{formatDateTime(d.updatedAt)}</Td>
                  </tr>
                ))}
              </tbody>
            </Table>
          )}
          <p className="mt-2 text-xs text-ink-soft">Tick two to four designs to compare them side by side.</p>
        </QueryState>
      </Card>
      <Card title="Frozen versions">
        <QueryState query={versions} label="Loading frozen versions…">
          {(versions.data ?? []).length === 0 ? (
            <p className="text-sm text-ink-soft">Nothing frozen yet. Exports and power runs cite a frozen version by its hash.</p>
          ) : (
            <Table caption="Frozen versions of this study's designs">
              <thead className="bg-paper-sunk">
                <tr>
                  <Th>Design</Th>
                  <Th>Version</Th>
                  <Th>SHA-256 of the canonical JSON</Th>
                  <Th>Frozen</Th>
                </tr>
              </thead>
              <tbody className="divide-y divide-ink/10" data-testid="study-versions">
                {(versions.data ?? []).map((v) => (
                  <tr key={v.id}>
                    <Td>{v.content.spec.name}</Td>
                    <Td>{v.number}</Td>
                    <Td className="break-all font-mono text-xs">{v.hash}</Td>
                    <Td className="text-ink-soft">{formatDateTime(v.createdAt)}</Td>
                  </tr>
                ))}
              </tbody>
            </Table>
          )}
        </QueryState>
      </Card>
      {can('editor') ? (
        <Card title="New design">
          <form onSubmit={onCreate} className="grid gap-3 sm:grid-cols-3" noValidate>
            <TextField label="New design name" value={name} onChange={(e) => setName(e.target.value)} error={nameError ?? undefined} />
            <SelectField label="Prior set for the new design" value={chosenPrior ?? ''} onChange={(e) => setPriorId(Number(e.target.value))}>
              {(priors.data ?? []).map((p) => (
                <option key={p.id} value={p.id}>
                  {p.name}
                </option>
              ))}
            </SelectField>
            <div className="flex items-end">
              <Button type="submit" disabled={create.isPending}>
                Create design
              </Button>
            </div>
          </form>
          {priors.data && priors.data.length === 0 ? (
            <div className="mt-3">
              <Notice tone="warning">
                A design needs a prior set.{' '}
                <Link className="underline" href={`/studies/${study.id}/priors`}>
                  Create one first
                </Link>
                .
              </Notice>
            </div>
          ) : null}
        </Card>
      ) : null}
    </div>
  );
}
