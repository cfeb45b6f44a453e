'use client';

import { zodResolver } from '@hookform/resolvers/zod';
import { useQueryClient } from '@tanstack/react-query';
import { useEffect, useState } from 'react';
import { useForm, useWatch, type Resolver } from 'react-hook-form';
import { Button } from '@/components/ui/button';
import { Card } from '@/components/ui/card';
import { Notice } from '@/components/ui/notice';
import { ApiClientError } from '@/lib/client/api';
import { plannerKeys, useUpdateDesign, type DesignDto, type PriorSetDto } from '@/lib/client/planner';
import { designFormSchema, hasUnsavedEdits, toForm, toSpec, type DesignFormValues } from '@/lib/shared/planner/design-form-values';
import { designSpecSchema, type DesignSpec } from '@/lib/shared/validations/planner';
import { DesignCharts } from './design-charts';
import { DesignFields } from './design-fields';
import { DesignNumbers } from './design-numbers';
import { EstimateCaution } from './estimate-caution';
import { PowerPreview } from './power-preview';
import { useLiveSummary } from './use-live-summary';
import { useUnsavedWarning } from './use-unsaved-warning';

const resolver: Resolver<DesignFormValues, unknown, DesignSpec> = zodResolver(designFormSchema);

/**
 * The design form with its numbers recomputed in the browser as fields change. Saving sends the
 * version the form was loaded from; a stale save gets 409, the typed values stay, and the
 * current version can be loaded underneath them.
 */
export function DesignEditor({
  studyId,
  design,
  priors,
  canEdit,
  onDirtyChange,
}: {
  studyId: number;
  design: DesignDto;
  priors: PriorSetDto[];
  canEdit: boolean;
  /** told whenever the form gains or loses unsaved edits (the freeze panel refuses to freeze then) */
  onDirtyChange?: (dirty: boolean) => void;
}) {
  const client = useQueryClient();
  const update = useUpdateDesign(studyId, design.id);
  const [conflict, setConflict] = useState(false);
  const [saved, setSaved] = useState(false);
  const { register, handleSubmit, formState, setError, reset, control } = useForm<DesignFormValues, unknown, DesignSpec>({
    resolver,
    values: toForm(design.spec),
    resetOptions: { keepDirtyValues: true },
    mode: 'onChange',
  });
  const values = useWatch({ control }) as DesignFormValues;
  // Unsaved = the values differ from the saved design. Not formState.isDirty: when the form's
  // values are reset under an edit typed in the same instant (the reset that follows the first
  // render of a cached design, or a refetch), react-hook-form keeps the edit but clears isDirty.
  const dirty = hasUnsavedEdits(values, design.spec);
  useUnsavedWarning(dirty);
  useEffect(() => onDirtyChange?.(dirty), [dirty, onDirtyChange]);
  const parsed = designSpecSchema.safeParse(toSpec(values));
  const priorSet = priors.find((p) => p.id === Number(values.priorSetId)) ?? null;
  const prior = priorSet?.values ?? null;
  const live = useLiveSummary(parsed.success ? parsed.data : null, prior);

  const onSubmit = handleSubmit(async (spec) => {
    setConflict(false);
    setSaved(false);
    try {
      const result = await update.mutateAsync({ spec, version: design.version });
      reset(toForm(result.spec));
      setSaved(true);
    } catch (error) {
      if (error instanceof ApiClientError && error.status === 409) setConflict(true);
      else if (error instanceof ApiClientError) for (const issue of error.issues) setError(issue.path.replace(/^spec\./, '') as keyof DesignFormValues, { message: issue.message });
    }
  });

  return (
    <div className="grid gap-6 xl:grid-cols-5">
      <Card title="Settings" className="xl:col-span-2">
        <form onSubmit={onSubmit} noValidate className="space-y-4" aria-label="Design settings">
          {conflict ? (
            <Notice tone="warning" title="Someone else saved this design first">
              Your changes are still in the form. Load their version underneath your changes, then save again.
              <div className="mt-2">
                <Button size="sm" variant="secondary" onClick={() => client.invalidateQueries({ queryKey: plannerKeys.design(studyId, design.id), exact: true }).then(() => setConflict(false))}>
                  Load the current version
                </Button>
              </div>
            </Notice>
          ) : null}
          {update.error && !conflict && !(update.error instanceof ApiClientError && update.error.issues.length) ? <Notice tone="error">{update.error.message}</Notice> : null}
          {saved && !dirty ? <Notice>Saved.</Notice> : null}
          {!canEdit ? <p className="text-xs text-ink-soft">You can read these settings; editors change them.</p> : null}
          <fieldset disabled={!canEdit}>
            <DesignFields register={register} errors={formState.errors} values={values} priors={priors} />
          </fieldset>
          {canEdit ? (
            <div className="flex items-center gap-3">
              <Button type="submit" disabled={formState.isSubmitting || !dirty}>
                Save design
              </Button>
              {dirty ? <span className="text-xs text-amber-700">Unsaved changes — the numbers on the right already show them</span> : null}
            </div>
          ) : null}
        </form>
      </Card>
      <div className="space-y-4 xl:col-span-3">
        <Card title="What this design does">
          {!parsed.success ? <Notice tone="warning">Fix the highlighted fields to see the numbers.</Notice> : null}
          {parsed.success && !prior ? <Notice tone="warning">The chosen prior set was not found; choose another.</Notice> : null}
          {live.error ? <Notice tone="error" title="These settings cannot be computed">{live.error}</Notice> : null}
          {live.summary ? (
            <div className="space-y-6">
              <DesignCharts summary={live.summary} currency={parsed.success ? parsed.data.currency : ''} />
              <DesignNumbers summary={live.summary} />
            </div>
          ) : null}
        </Card>
        <PowerPreview studyId={studyId} design={design} spec={parsed.success ? parsed.data : null} prior={priorSet} dirty={dirty} canRun={canEdit} />
        <EstimateCaution />
      </div>
    </div>
  );
}
