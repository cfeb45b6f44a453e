'use client';

import type { FieldErrors, UseFormRegister } from 'react-hook-form';
import { SelectField, TextField } from '@/components/ui/field';
import type { PriorSetDto } from '@/lib/client/planner';
import type { DesignFormValues } from '@/lib/shared/planner/design-form-values';
import { MODEL_CHOICES, STAGE_ONE_FIT_CHOICES } from '@/lib/shared/validations/planner';
import { CRITERION_LABELS, MODEL_LABELS, STAGE_ONE_FIT_LABELS } from './labels';
import { TermHelp } from '@/components/glossary/term-help';

type Props = { register: UseFormRegister<DesignFormValues>; errors: FieldErrors<DesignFormValues>; values: DesignFormValues; priors: PriorSetDto[] };

/** The controls of a candidate design, grouped as a methodologist reads them; units in every label. */
export function DesignFields({ register, errors: e, values, priors }: Props) {
  const num = { valueAsNumber: true } as const;
  const usesS = ['hyperboloid', 'power-delay', 'exponential-power'].includes(values.model?.id);
  return (
    <div className="space-y-5">
      <TextField label="Design name" {...register('name')} error={e.name?.message} />
      <fieldset className="grid gap-3 sm:grid-cols-2">
        <legend className="mb-1 text-sm font-semibold">Prior and model</legend>
        <SelectField label="Prior set" {...register('priorSetId', num)} error={e.priorSetId?.message}>
          {priors.map((p) => (
            <option key={p.id} value={p.id}>
              {p.name}
            </option>
          ))}
        </SelectField>
        <SelectField label="Assumed discount model" {...register('model.id')} error={e.model?.id?.message}>
          {MODEL_CHOICES.map((m) => (
            <option key={m} value={m}>
              {MODEL_LABELS[m]}
            </option>
          ))}
        </SelectField>
        {usesS ? <TextField label="Delay sensitivity s" type="number" step="any" {...register('model.sensitivity', num)} error={e.model?.sensitivity?.message} hint="1 gives the model’s usual form" /> : null}
        {values.model?.id === 'quasi-hyperbolic' ? <TextField label="Present bias β" type="number" step="any" {...register('model.presentBias', num)} error={e.model?.presentBias?.message} hint="0 < β ≤ 1" /> : null}
        <TextField label="Choice sensitivity γ (per unit of the larger amount)" type="number" step="any" {...register('choiceSensitivity', num)} error={e.choiceSensitivity?.message} hint="logistic choice noise; larger is less noisy" />
      </fieldset>
      <fieldset className="grid gap-3 sm:grid-cols-3">
        <legend className="mb-1 text-sm font-semibold">Rewards</legend>
        <TextField label="Magnitude ratio S/L" type="number" step="any" {...register('ratio', num)} error={e.ratio?.message} hint="between 0 and 1" />
        <TextField label="Large amount L" type="number" step="any" {...register('largeAmount', num)} error={e.largeAmount?.message} />
        <TextField label="Currency" {...register('currency')} error={e.currency?.message} hint="three letters, e.g. EUR" />
      </fieldset>
      <fieldset className="grid gap-3 sm:grid-cols-3">
        <legend className="mb-1 text-sm font-semibold">Delays</legend>
        <SelectField label="Design type" {...register('mode')} error={e.mode?.message}>
          <option value="personalised">Personalised (calibration block, then probe block)</option>
          <option value="population">Population (one set of pairs for everyone)</option>
        </SelectField>
        <SelectField label="Soon delay" {...register('soonDelay.mode')}>
          <option value="fixed">Fixed</option>
          <option value="optimised">Optimised within bounds</option>
        </SelectField>
        <TextField label="Late-delay limit (days)" type="number" step="1" {...register('lateDelayLimit', num)} error={e.lateDelayLimit?.message} hint="at most 9131 (25 years)" />
        {values.soonDelay?.mode === 'fixed' ? (
          <TextField label="Soon delay d (days)" type="number" step="1" {...register('soonDelay.days', num)} error={e.soonDelay?.days?.message} />
        ) : (
          <>
            <TextField label="Shortest soon delay (days)" type="number" step="1" {...register('soonDelay.min', num)} error={e.soonDelay?.min?.message} />
            <TextField label="Longest soon delay (days)" type="number" step="1" {...register('soonDelay.max', num)} error={e.soonDelay?.max?.message} />
          </>
        )}
      </fieldset>
      <fieldset className="grid gap-3 sm:grid-cols-3">
        <legend className="mb-1 text-sm font-semibold">
          <TermHelp id="pair-roles">Pairs</TermHelp> and criterion
        </legend>
        <TextField label="Reversal probes" type="number" step="1" {...register('probePairs', num)} error={e.probePairs?.message} />
        <TextField label="Late anchors" type="number" step="1" {...register('lateAnchors', num)} error={e.lateAnchors?.message} />
        <TextField label="Soon anchors" type="number" step="1" {...register('soonAnchors', num)} error={e.soonAnchors?.message} />
        <div className="sm:col-span-3">
          <SelectField label="Criterion" {...register('criterion')} error={e.criterion?.message} hint={
              <>
                what the delays are chosen to maximise: <TermHelp id="gap-product">gap product</TermHelp>, <TermHelp id="expected-reversal-rate">expected reversal rate</TermHelp>,{' '}
                <TermHelp id="maximin-gap">maximin gap</TermHelp> or <TermHelp id="model-discrimination">model discrimination</TermHelp> (probes that tell the hyperbolic and exponential models apart)
              </>
            }
          >
            {Object.entries(CRITERION_LABELS).map(([value, label]) => (
              <option key={value} value={value}>
                {label}
              </option>
            ))}
          </SelectField>
        </div>
        {values.criterion === 'model-discrimination' ? (
          <div className="sm:col-span-3">
            <TextField
              label="Reversal weight"
              type="number"
              step="any"
              {...register('reversalWeight', num)}
              error={e.reversalWeight?.message}
              hint="weight of the expected reversal beside the models’ divergence; 0 = pure discrimination (probes may fall outside the reversal zone)"
            />
          </div>
        ) : null}
      </fieldset>
      <fieldset className="grid gap-3 sm:grid-cols-3">
        <legend className="mb-1 text-sm font-semibold">
          <TermHelp id="calibration-block">Calibration block</TermHelp>
        </legend>
        <TextField label="Items per magnitude" type="number" step="1" {...register('calibration.itemsPerMagnitude', num)} error={e.calibration?.itemsPerMagnitude?.message} />
        <TextField label="Shortest calibration delay (days)" type="number" step="1" {...register('calibration.minDelay', num)} error={e.calibration?.minDelay?.message} />
        <TextField label="Longest calibration delay (days)" type="number" step="1" {...register('calibration.maxDelay', num)} error={e.calibration?.maxDelay?.message} />
        <div className="sm:col-span-3 grid gap-3 sm:grid-cols-2">
          <SelectField
            label="Calibration delays"
            {...register('calibration.placement')}
            error={e.calibration?.placement?.message}
            hint={
              <>
                spanning the probes raises the longest delay to the late delays the probes will use across the prior, in log-spaced levels (
                <TermHelp id="calibration-spanning-probes">why</TermHelp>)
              </>
            }
          >
            <option value="range">Between the shortest and longest delay above</option>
            <option value="span-probes">Spanning the probes’ late delays</option>
          </SelectField>
          <SelectField
            label="Stage-1 model"
            {...register('calibration.fit')}
            error={e.calibration?.fit?.message}
            hint={
              <>
                a model with a <TermHelp id="delay-sensitivity">delay sensitivity</TermHelp> s estimates s with k and K, and the probes are built under it (needs delays spanning the probes)
              </>
            }
          >
            {STAGE_ONE_FIT_CHOICES.map((f) => (
              <option key={f} value={f}>
                {STAGE_ONE_FIT_LABELS[f]}
              </option>
            ))}
          </SelectField>
        </div>
        <label className="flex items-center gap-2 text-sm sm:col-span-3">
          <input type="checkbox" {...register('calibration.adaptive.enabled')} />
          <span>
            <TermHelp id="adaptive-calibration">Adaptive calibration</TermHelp>: each participant’s next question is the one expected to tell most about their rates (adaptive design optimisation)
          </span>
        </label>
        {values.calibration?.adaptive?.enabled ? (
          <>
            <TextField label="Most adaptive items (both magnitudes)" type="number" step="1" {...register('calibration.adaptive.maxItems', num)} error={e.calibration?.adaptive?.maxItems?.message} hint="replaces the fixed block’s 2 × items per magnitude" />
            <TextField label="Stop at posterior SD of ln k and ln K" type="number" step="any" {...register('calibration.adaptive.targetSd', num)} error={e.calibration?.adaptive?.targetSd?.message} hint="0 asks every item; 0.3 is about ±35 % in k" />
          </>
        ) : null}
      </fieldset>
    </div>
  );
}
