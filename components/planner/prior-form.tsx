'use client';

import { zodResolver } from '@hookform/resolvers/zod';
import { useQueryClient } from '@tanstack/react-query';
import { useMemo, useState } from 'react';
import { useForm, useWatch } from 'react-hook-form';
import type { z } from 'zod';
import { Button } from '@/components/ui/button';
import { TextArea, TextField } from '@/components/ui/field';
import { Notice } from '@/components/ui/notice';
import { ApiClientError } from '@/lib/client/api';
import { plannerKeys, useCreatePrior, useUpdatePrior, type PriorSetDto } from '@/lib/client/planner';
import { rememberFit, restoreExact, shownValue, type FittedValues } from '@/lib/shared/planner/fitted-precision';
import { priorSetSchema, type PriorValues } from '@/lib/shared/validations/planner';
import { PilotUpload } from './pilot-upload';
import { PriorChart } from './prior-chart';
import { useUnsavedWarning } from './use-unsaved-warning';

type Values = z.input<typeof priorSetSchema>;

const BLANK: Values = { name: '', medianSmall: 0.02, medianLarge: 0.008, sdLogSmall: 0.8, sdLogLarge: 0.8, correlation: 0.6, source: 'manual', notes: '' };

/** The form's values for a saved prior: numbers shown to four significant digits (the exact ones are kept aside). */
function toValues(p: PriorSetDto): Values {
  const shown = Object.fromEntries(Object.entries(p.values).map(([key, value]) => [key, shownValue(value)])) as PriorValues;
  return { name: p.name, ...shown, source: p.source, notes: p.notes };
}

/** Create or edit a prior set, with the live chart; a stale save gets 409 and the typed values stay. */
export function PriorForm({ studyId, prior, canEdit, onSaved }: { studyId: number; prior: PriorSetDto | null; canEdit: boolean; onSaved: (p: PriorSetDto) => void }) {
  const client = useQueryClient();
  const create = useCreatePrior(studyId);
  const update = useUpdatePrior(studyId, prior?.id ?? 0);
  const [conflict, setConflict] = useState(false);
  const [saved, setSaved] = useState(false);
  // exact values (saved, or of a pilot fit) while the fields show them at four significant digits
  const [pilotFit, setFitted] = useState<FittedValues<keyof PriorValues>>({});
  const fitted = useMemo(() => ({ ...(prior ? rememberFit(prior.values) : {}), ...pilotFit }), [prior, pilotFit]);
  const { register, handleSubmit, formState, setError, reset, control, setValue } = useForm<Values>({
    resolver: zodResolver(priorSetSchema),
    values: prior ? toValues(prior) : BLANK,
    resetOptions: { keepDirtyValues: true },
  });
  const live = useWatch({ control });
  useUnsavedWarning(formState.isDirty);
  const num = { valueAsNumber: true } as const;
  const e = formState.errors;

  const onSubmit = handleSubmit(async (typed) => {
    const values = restoreExact(typed, fitted);
    setConflict(false);
    setSaved(false);
    try {
      const result = prior ? await update.mutateAsync({ prior: values, version: prior.version }) : await create.mutateAsync(values);
      reset(toValues(result));
      setFitted({});
      setSaved(true);
      onSaved(result);
    } catch (error) {
      if (error instanceof ApiClientError && error.status === 409) setConflict(true);
      else if (error instanceof ApiClientError) for (const issue of error.issues) setError(issue.path as keyof Values, { message: issue.message });
    }
  });
  const failure = (prior ? update.error : create.error) as Error | null;

  return (
    <form onSubmit={onSubmit} className="space-y-4" noValidate aria-label="Prior set">
      {conflict ? (
        <Notice tone="warning" title="Someone else changed this prior set">
          Your values are still in the form. Load their version, then save again to keep yours.
          <div className="mt-2">
            <Button size="sm" variant="secondary" onClick={() => client.invalidateQueries({ queryKey: plannerKeys.priors(studyId) }).then(() => setConflict(false))}>
              Load the current version
            </Button>
          </div>
        </Notice>
      ) : null}
      {failure && !conflict && !(failure instanceof ApiClientError && failure.issues.length) ? <Notice tone="error">{failure.message}</Notice> : null}
      {saved && !formState.isDirty ? <Notice>Saved.</Notice> : null}
      {!canEdit ? <p className="text-xs text-ink-soft">You can read this prior set and explore its picture below; editors change it.</p> : null}
      <fieldset disabled={!canEdit} className="space-y-4">
        <TextField label="Prior set name" {...register('name')} error={e.name?.message} />
        <div className="grid gap-3 sm:grid-cols-2">
          <TextField label="Median rate, small reward (per day)" type="number" step="any" {...register('medianSmall', num)} error={e.medianSmall?.message} />
          <TextField label="Median rate, large reward (per day)" type="number" step="any" {...register('medianLarge', num)} error={e.medianLarge?.message} />
          <TextField label="Spread, small reward (SD of ln k)" type="number" step="any" {...register('sdLogSmall', num)} error={e.sdLogSmall?.message} />
          <TextField label="Spread, large reward (SD of ln K)" type="number" step="any" {...register('sdLogLarge', num)} error={e.sdLogLarge?.message} />
          <TextField label="Correlation of ln k and ln K" type="number" step="any" {...register('correlation', num)} error={e.correlation?.message} hint="between −0.99 and 0.99" />
        </div>
        {Object.values(fitted).some((f) => f && f.shown !== f.exact) ? (
          <p className="text-xs text-ink-soft" data-testid="fitted-precision">
            Values are shown to four significant digits; the exact values are kept for every field you leave as shown.
          </p>
        ) : null}
        <TextArea label="Notes" rows={2} {...register('notes')} error={e.notes?.message} />
        {canEdit ? (
          <PilotUpload
            studyId={studyId}
            onFitted={(fit, fileName) => {
              const exact = rememberFit(fit.prior);
              setFitted(exact);
              for (const [key, value] of Object.entries(exact)) setValue(key as keyof Values, value!.shown, { shouldDirty: true, shouldValidate: true });
              setValue('source', 'pilot', { shouldDirty: true });
              setValue('notes', [`Fitted from ${fit.rows} participants (${fileName}).`, ...fit.notes].join(' '), { shouldDirty: true });
            }}
          />
        ) : null}
      </fieldset>
      {canEdit ? (
        <div className="flex items-center gap-3">
          <Button type="submit" disabled={formState.isSubmitting || (!!prior && !formState.isDirty)}>
            {prior ? 'Save prior set' : 'Create prior set'}
          </Button>
          {formState.isDirty ? <span className="text-xs text-amber-700">Unsaved changes</span> : null}
        </div>
      ) : null}
      <PriorChart values={live as Partial<Values> as never} />
    </form>
  );
}
