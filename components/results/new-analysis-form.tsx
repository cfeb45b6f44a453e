'use client';

import { useState } from 'react';
import { Button } from '@/components/ui/button';
import { SelectField, TextField } from '@/components/ui/field';
import { Notice } from '@/components/ui/notice';
import { QueryState } from '@/components/ui/query-state';
import { ApiClientError } from '@/lib/client/api';
import { useCreateAnalysis, useObservedSummary } from '@/lib/client/results';
import { DEFAULT_EXCLUSIONS, type ExclusionRulesInput } from '@/lib/shared/validations/analysis';
import { SOURCE_LABELS } from '@/lib/shared/results/stored-analysis';

const RULES = [
  ['attentionCheck', 'Failed attention check'],
  ['flaggedEstimates', 'Flagged calibration estimates (served the fallback set)'],
  ['incompleteBlocks', 'Incomplete blocks (an unanswered calibration item or pair)'],
] as const;

/**
 * States the analysis before looking: exclusion rules (each with the number of participants it
 * applies to and removes), the test's direction and the zone model; saving runs and stores it.
 */
export function NewAnalysisForm({ studyId, versionId, onCreated }: { studyId: number; versionId: number; onCreated: (id: number) => void }) {
  const [rules, setRules] = useState<ExclusionRulesInput>(DEFAULT_EXCLUSIONS);
  const [name, setName] = useState('Main analysis');
  const [alternative, setAlternative] = useState<'greater' | 'two-sided'>('greater');
  const [zoneModel, setZoneModel] = useState('bic');
  const summary = useObservedSummary(studyId, versionId, rules);
  const create = useCreateAnalysis(studyId);
  const [error, setError] = useState<ApiClientError | null>(null);
  const counts = new Map((summary.data?.exclusions ?? []).map((r) => [r.rule, r]));

  async function save() {
    setError(null);
    try {
      const analysis = await create.mutateAsync({ name, designVersionId: versionId, exclusions: rules, alternative, alpha: 0.05, zoneModel });
      onCreated(analysis.id);
    } catch (e) {
      if (e instanceof ApiClientError) setError(e);
      else throw e;
    }
  }

  return (
    <div className="space-y-4">
      <QueryState query={summary}>
        {summary.data ? (
          <p className="text-sm" data-testid="observed-summary">
            {summary.data.participants} participants served with this version, {summary.data.withAnswers} with stage-2 answers, {summary.data.complete} complete; {summary.data.kept} kept by the rules below.
          </p>
        ) : null}
      </QueryState>
      <fieldset className="space-y-2">
        <legend className="text-sm font-medium">Exclusion rules (stated before looking at the results)</legend>
        {RULES.map(([key, label]) => (
          <label key={key} className="flex items-center gap-2 text-sm">
            <input type="checkbox" checked={rules[key]} onChange={(e) => setRules({ ...rules, [key]: e.target.checked })} />
            <span>{label}</span>
            <span className="text-ink-soft">— applies to {counts.get(key)?.applies ?? '…'}, removes {counts.get(key)?.removes ?? '…'}</span>
          </label>
        ))}
        <label className="flex flex-wrap items-center gap-2 text-sm">
          <input type="checkbox" checked={rules.responseTimeFloor.enabled} onChange={(e) => setRules({ ...rules, responseTimeFloor: { ...rules.responseTimeFloor, enabled: e.target.checked } })} />
          <span>Any response faster than</span>
          <input
            type="number"
            min={0}
            max={60000}
            aria-label="Response-time floor in milliseconds"
            className="w-24 rounded-md border border-ink/20 px-2 py-1"
            value={rules.responseTimeFloor.ms}
            onChange={(e) => setRules({ ...rules, responseTimeFloor: { ...rules.responseTimeFloor, ms: Math.max(0, Math.round(Number(e.target.value) || 0)) } })}
          />
          <span>ms</span>
          <span className="text-ink-soft">— applies to {counts.get('responseTimeFloor')?.applies ?? '…'}, removes {counts.get('responseTimeFloor')?.removes ?? '…'}</span>
        </label>
      </fieldset>
      <div className="grid gap-4 sm:grid-cols-3">
        <TextField label="Analysis name" value={name} maxLength={120} onChange={(e) => setName(e.target.value)} hint="Saving again under the same name makes the next version." />
        <SelectField label="Test direction" value={alternative} onChange={(e) => setAlternative(e.target.value as 'greater' | 'two-sided')}>
          <option value="greater">One-sided: more LS than SL</option>
          <option value="two-sided">Two-sided</option>
        </SelectField>
        <SelectField label="Zone diagnosis under" value={zoneModel} onChange={(e) => setZoneModel(e.target.value)}>
          <option value="bic">The model with the smallest summed BIC</option>
          <option value="aic">The model with the smallest summed AIC</option>
          {Object.entries(SOURCE_LABELS)
            .filter(([k]) => k !== 'observed' && k !== 'design')
            .map(([k, label]) => (
              <option key={k} value={k}>
                {label}
              </option>
            ))}
        </SelectField>
      </div>
      {error ? (
        <Notice tone="error" title="Not saved">
          <p>{error.message}</p>
          {error.issues.map((i, n) => (
            <p key={n}>
              {i.path}: {i.message}
            </p>
          ))}
        </Notice>
      ) : null}
      <Button onClick={save} disabled={create.isPending || !name.trim()}>
        {create.isPending ? 'Running the analysis…' : 'Run and save the analysis'}
      </Button>
    </div>
  );
}
