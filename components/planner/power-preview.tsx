'use client';

import { useRouter } from 'next/navigation';
import { useMemo, useState } from 'react';
import { PowerChart } from '@/components/power/power-chart';
import { Button } from '@/components/ui/button';
import { Card } from '@/components/ui/card';
import { SelectField, TextField } from '@/components/ui/field';
import { Notice } from '@/components/ui/notice';
import { usePowerPreview } from '@/lib/client/power-preview';
import { usePowerRuns, useStartPowerRun } from '@/lib/client/power';
import type { DesignDto, PriorSetDto } from '@/lib/client/planner';
import { PREVIEW_REPLICATIONS, PREVIEW_SEED, PREVIEW_SIZES, previewSettings, SAVED_RUN_REPLICATIONS, type PreviewInput } from '@/lib/shared/power-preview';
import type { DesignSpec } from '@/lib/shared/validations/planner';
import { DEFAULT_POWER_TEST, parseSampleSizes, POWER_TEST_LABELS, POWER_TESTS, testWarning } from '@/lib/shared/validations/power';

type TestKind = (typeof POWER_TESTS)[number];

/**
 * A power curve for the design as it stands in the form, simulated in the browser with a few hundred
 * replications a moment after each change (clearly labelled a preview), and a button that starts
 * the same simulation as a saved run with full replications once the saved draft is frozen.
 */
export function PowerPreview({ studyId, design, spec, prior, dirty, canRun }: { studyId: number; design: DesignDto; spec: DesignSpec | null; prior: PriorSetDto | null; dirty: boolean; canRun: boolean }) {
  const router = useRouter();
  const runs = usePowerRuns(studyId);
  const start = useStartPowerRun(studyId);
  // the study's test: the one its newest saved run used, until the user picks another here
  const studyTest = runs.data?.[0]?.spec.test.kind ?? DEFAULT_POWER_TEST;
  const [picked, setPicked] = useState<TestKind | null>(null);
  const test = picked ?? studyTest;
  const [sizesText, setSizesText] = useState(PREVIEW_SIZES);
  const sampleSizes = parseSampleSizes(sizesText);
  const sizesError = sampleSizes && sampleSizes.length >= 2 && sampleSizes.length <= 40 ? undefined : 'Give 2 to 40 sample sizes in increasing order, e.g. 20:200:20 or 20, 50, 100.';
  const specKey = spec && prior ? JSON.stringify([spec, prior.values, prior.name]) : '';
  const input = useMemo((): PreviewInput | null => {
    if (!spec || !prior || sizesError || !sampleSizes) return null;
    return { content: { spec, prior: { ...prior.values, name: prior.name } }, test: { kind: test, alpha: 0.05, alternative: 'greater' }, sampleSizes, replications: PREVIEW_REPLICATIONS };
    // eslint-disable-next-line react-hooks/exhaustive-deps -- keyed on the values
  }, [specKey, test, sizesText]);
  const preview = usePowerPreview(input);
  const shown = preview.summary;
  const series = useMemo(() => (shown ? [{ label: 'Preview', points: shown.points }] : []), [shown]);
  const version = design.latestVersion;
  const frozenAsShown = design.frozen && version !== null && !dirty;
  const warning = testWarning(test);

  const save = async () => {
    if (!input || !version) return;
    const run = await start.mutateAsync({ designVersionId: version.id, label: `${design.name}: from the preview`, stress: [], ...previewSettings(input, SAVED_RUN_REPLICATIONS) });
    router.push(`/studies/${studyId}/power/${run.id}`);
  };

  return (
    <Card title="Power preview">
      <div className="space-y-3 text-sm" data-testid="power-preview">
        <p>
          <span className="mr-2 rounded bg-amber-100 px-1.5 py-0.5 text-xs font-semibold uppercase tracking-wide text-amber-900" data-testid="preview-label">
            Preview
          </span>
          {PREVIEW_REPLICATIONS} replications (seed {PREVIEW_SEED}) of the design as it stands in the form, under the truth it assumes, recomputed a moment after each
          change. The band is the 95 % Wilson interval of the Monte Carlo estimate; a saved run narrows it.
        </p>
        <div className="grid gap-3 sm:grid-cols-2">
          <SelectField label="Test of the preview" value={test} onChange={(e) => setPicked(e.target.value as TestKind)}>
            {POWER_TESTS.map((kind) => (
              <option key={kind} value={kind}>
                {POWER_TEST_LABELS[kind]}
              </option>
            ))}
          </SelectField>
          <TextField label="Sample sizes of the preview" value={sizesText} onChange={(e) => setSizesText(e.target.value)} error={sizesError} hint="start:end:step, or a list" />
        </div>
        <p className="text-xs text-ink-soft" data-testid="preview-status" aria-live="polite">
          {previewStatus(preview.status, preview.completed, preview.total, preview.elapsedMs)}
        </p>
        {preview.error ? (
          <Notice tone="error" title="The preview cannot be computed">
            {preview.error}
          </Notice>
        ) : null}
        {shown ? (
          <div className={preview.status === 'done' ? '' : 'opacity-60'}>
            <PowerChart series={series} title="Power (preview)" caption={`Preview: ${shown.replicates} replications, seed ${PREVIEW_SEED}; not a saved run.`} notes={warning ? [warning] : undefined} />
          </div>
        ) : null}
        {canRun ? (
          <div className="space-y-1">
            <Button onClick={save} disabled={!frozenAsShown || !input || start.isPending || preview.status === 'error'}>
              Start a saved run ({SAVED_RUN_REPLICATIONS.toLocaleString('en')} replications)
            </Button>
            {!frozenAsShown ? <p className="text-xs text-ink-soft">Saved runs cite a frozen version: save and freeze the design first.</p> : null}
            {start.error ? <Notice tone="error">{start.error.message}</Notice> : null}
          </div>
        ) : null}
        <p className="text-xs text-ink-soft">Power figures are estimates from simulated hypothetical choices, not a clinical assessment of any person.</p>
      </div>
    </Card>
  );
}

function previewStatus(status: string, completed: number, total: number, elapsedMs: number | null): string {
  switch (status) {
    case 'waiting':
      return 'Preview: waiting for the changes to settle…';
    case 'running':
      return `Preview: simulating… ${completed} of ${total} replications`;
    case 'done':
      return `Preview: up to date${elapsedMs !== null ? ` (${(elapsedMs / 1000).toFixed(1)} s after the last change)` : ''}.`;
    case 'error':
      return 'Preview: stopped.';
    default:
      return 'Preview: appears once the settings are valid.';
  }
}
