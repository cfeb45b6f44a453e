'use client';

import { useRouter } from 'next/navigation';
import { useState, type FormEvent } from 'react';
import { Button } from '@/components/ui/button';
import { SelectField, TextField } from '@/components/ui/field';
import { Notice } from '@/components/ui/notice';
import { useStudyContext } from '@/components/studies/study-context';
import { ApiClientError } from '@/lib/client/api';
import { useVersions, type VersionDto } from '@/lib/client/planner';
import { useStartPowerRun } from '@/lib/client/power';
import { DEFAULT_CHOICE_SENSITIVITY } from '@/lib/design/designChoiceModel';
import { MODEL_CHOICES } from '@/lib/shared/validations/planner';
import { STRESS_DEFAULTS, STRESS_KINDS } from '@/lib/design/power/stressTruth';
import { assumedTruth, DEFAULT_LAPSE, STRESS_LABELS, DEFAULT_POWER_TEST, parseSampleSizes, POWER_TEST_LABELS, POWER_TESTS, powerRunSpecSchema } from '@/lib/shared/validations/power';

type Values = Record<string, string>;

const MODEL_LABELS: Record<string, string> = {
  exponential: 'Exponential',
  hyperbolic: 'Hyperbolic',
  hyperboloid: 'Hyperboloid',
  'power-delay': 'Power-delay hyperbola',
  'exponential-power': 'Exponential with delay sensitivity',
  'quasi-hyperbolic': 'Quasi-hyperbolic (β–δ)',
};

function fromVersion(v: VersionDto | undefined, previous: Values): Values {
  if (!v) return { ...previous, version: '' };
  const truth = assumedTruth(v.content);
  const { prior: p, model: m } = truth;
  return {
    ...previous,
    version: String(v.id),
    model: m.id,
    sensitivity: String(m.sensitivity ?? 1),
    presentBias: String(m.presentBias ?? 1),
    medianSmall: String(p.medianSmall),
    medianLarge: String(p.medianLarge),
    sdLogSmall: String(p.sdLogSmall),
    sdLogLarge: String(p.sdLogLarge),
    correlation: String(p.correlation),
    // the truth chooses as the design assumes unless the user says otherwise: one γ per frozen version
    gamma: String(truth.gamma),
    lapse: String(truth.lapse),
  };
}

const DEFAULTS: Values = { label: '', gamma: String(DEFAULT_CHOICE_SENSITIVITY), lapse: String(DEFAULT_LAPSE), calibration: 'simulated', test: DEFAULT_POWER_TEST, alpha: '0.05', alternative: 'greater', sizes: '20:200:20', replications: '500', seed: '1',
  // the known way to miss the zone is simulated unless the user unticks it
  'stress.delay-sensitivity': 'on',
  stressLow: String(STRESS_DEFAULTS['delay-sensitivity'].low),
  stressHigh: String(STRESS_DEFAULTS['delay-sensitivity'].high),
  stressBeta: String(STRESS_DEFAULTS['present-bias'].beta),
  stressFactor: String(STRESS_DEFAULTS['choice-noise'].factor),
};

/** The stress truths ticked in the form, with their parameters. */
function stressOf(v: Values) {
  const on = (kind: string) => v[`stress.${kind}`] === 'on';
  return [
    ...(on('delay-sensitivity') ? [{ kind: 'delay-sensitivity' as const, low: Number(v.stressLow), high: Number(v.stressHigh) }] : []),
    ...(on('no-magnitude-effect') ? [{ kind: 'no-magnitude-effect' as const }] : []),
    ...(on('present-bias') ? [{ kind: 'present-bias' as const, beta: Number(v.stressBeta) }] : []),
    ...(on('choice-noise') ? [{ kind: 'choice-noise' as const, factor: Number(v.stressFactor) }] : []),
    ...(on('other-model') ? [{ kind: 'other-model' as const }] : []),
  ];
}

/** Starts a run: the frozen version, the simulated truth (prefilled as the design assumes), the test and the simulation size. */
export function NewRunForm() {
  const { study } = useStudyContext();
  const router = useRouter();
  const versions = useVersions(study.id);
  const start = useStartPowerRun(study.id);
  const [values, setValues] = useState<Values>(DEFAULTS);
  const [errors, setErrors] = useState<Record<string, string>>({});
  const list = versions.data ?? [];
  const current = values.version ? values : list.length ? fromVersion(list[0], values) : values;
  const set = (key: string) => (e: { target: { value: string } }) => setValues({ ...current, [key]: e.target.value });

  const submit = async (event: FormEvent) => {
    event.preventDefault();
    const sizes = parseSampleSizes(current.sizes ?? '');
    const needsS = ['hyperboloid', 'power-delay', 'exponential-power'].includes(current.model);
    const spec = {
      designVersionId: Number(current.version),
      label: current.label,
      truth: {
        model: { id: current.model, ...(needsS ? { sensitivity: Number(current.sensitivity) } : {}), ...(current.model === 'quasi-hyperbolic' ? { presentBias: Number(current.presentBias) } : {}) },
        prior: {
          medianSmall: Number(current.medianSmall),
          medianLarge: Number(current.medianLarge),
          sdLogSmall: Number(current.sdLogSmall),
          sdLogLarge: Number(current.sdLogLarge),
          correlation: Number(current.correlation),
        },
        gamma: Number(current.gamma),
        lapse: Number(current.lapse),
      },
      calibration: current.calibration,
      stress: stressOf(current),
      ...(current.compareCalibration === 'on' ? { compareCalibration: true } : {}),
      test: { kind: current.test, alpha: Number(current.alpha), alternative: current.alternative },
      sampleSizes: sizes ?? [],
      replications: Number(current.replications),
      seed: Number(current.seed),
    };
    const parsed = powerRunSpecSchema.safeParse(spec);
    const found: Record<string, string> = {};
    if (!sizes) found.sampleSizes = 'Write sizes as "20, 40, 60" or start:end:step, e.g. 20:200:20.';
    if (!parsed.success) for (const issue of parsed.error.issues) found[issue.path.join('.')] ??= issue.message;
    setErrors(found);
    if (Object.keys(found).length) return;
    try {
      const run = await start.mutateAsync(parsed.data!);
      router.push(`/studies/${study.id}/power/${run.id}`);
    } catch (error) {
      if (error instanceof ApiClientError) setErrors(Object.fromEntries(error.issues.map((i) => [i.path, i.message])));
    }
  };

  if (versions.isPending) return <p className="text-sm text-ink-soft">Loading frozen designs…</p>;
  if (!list.length) return <Notice tone="info">Freeze a design first: power runs simulate a frozen design version.</Notice>;
  const err = (key: string) => errors[key] ?? Object.entries(errors).find(([k]) => k.startsWith(`${key}.`))?.[1];
  return (
    <form onSubmit={submit} className="space-y-5" noValidate aria-label="New power run">
      <div className="grid gap-4 sm:grid-cols-2">
        <SelectField label="Frozen design version" value={current.version} onChange={(e) => setValues(fromVersion(list.find((v) => String(v.id) === e.target.value), current))} error={err('designVersionId')}>
          {list.map((v) => (
            <option key={v.id} value={v.id}>
              {v.content.spec.name}, version {v.number} ({v.hash.slice(0, 8)})
            </option>
          ))}
        </SelectField>
        <TextField label="Label (shown in legends)" value={current.label} onChange={set('label')} error={err('label')} placeholder="e.g. Truth as the design assumes" />
      </div>
      <fieldset className="space-y-3">
        <legend className="text-sm font-semibold">Simulated truth</legend>
        <div className="grid gap-4 sm:grid-cols-3">
          <SelectField label="True discount model" value={current.model} onChange={set('model')} error={err('truth.model')}>
            {MODEL_CHOICES.map((m) => (
              <option key={m} value={m}>
                {MODEL_LABELS[m]}
              </option>
            ))}
          </SelectField>
          {['hyperboloid', 'power-delay', 'exponential-power'].includes(current.model) ? (
            <TextField label="True delay sensitivity s" inputMode="decimal" value={current.sensitivity} onChange={set('sensitivity')} error={err('truth.model.sensitivity')} />
          ) : null}
          {current.model === 'quasi-hyperbolic' ? <TextField label="True present bias β" inputMode="decimal" value={current.presentBias} onChange={set('presentBias')} error={err('truth.model.presentBias')} /> : null}
        </div>
        <div className="grid gap-4 sm:grid-cols-5">
          <TextField label="Median k (small)" inputMode="decimal" value={current.medianSmall} onChange={set('medianSmall')} error={err('truth.prior.medianSmall')} />
          <TextField label="Median K (large)" inputMode="decimal" value={current.medianLarge} onChange={set('medianLarge')} error={err('truth.prior.medianLarge')} />
          <TextField label="SD of ln k" inputMode="decimal" value={current.sdLogSmall} onChange={set('sdLogSmall')} error={err('truth.prior.sdLogSmall')} />
          <TextField label="SD of ln K" inputMode="decimal" value={current.sdLogLarge} onChange={set('sdLogLarge')} error={err('truth.prior.sdLogLarge')} />
          <TextField label="Correlation" inputMode="decimal" value={current.correlation} onChange={set('correlation')} error={err('truth.prior.correlation')} />
        </div>
        <div className="grid gap-4 sm:grid-cols-3">
          <TextField label="Choice sensitivity γ (per unit of the larger amount)" inputMode="decimal" value={current.gamma} onChange={set('gamma')} error={err('truth.gamma')} />
          <TextField label="Lapse rate ε" inputMode="decimal" value={current.lapse} onChange={set('lapse')} error={err('truth.lapse')} />
          <SelectField
            label="Calibration block"
            value={current.calibration}
            onChange={set('calibration')}
            hint="Adaptive: each simulated person is asked the items adaptive design optimisation picks (the design’s stop rule, else 12 items), to compare with the fixed block."
          >
            <option value="simulated">Simulated, rates re-estimated</option>
            <option value="adaptive">Adaptive calibration simulated (slower)</option>
            <option value="known">Not simulated: rates known</option>
          </SelectField>
        </div>
      </fieldset>
      <fieldset className="space-y-3">
        <legend className="text-sm font-semibold">Stress truths</legend>
        <p className="text-xs text-ink-soft">
          Each ticked deviation from the truth above is simulated as well, with the same design, test and seed; the results show power under each beside the assumed truth.
        </p>
        <div className="grid gap-2 sm:grid-cols-2">
          {STRESS_KINDS.map((kind) => {
            const key = `stress.${kind}`;
            const i = stressOf(current).findIndex((s) => s.kind === kind);
            return (
              <div key={kind} className="space-y-2 rounded border border-ink/10 p-3">
                <label className="flex items-start gap-2 text-sm">
                  <input type="checkbox" className="mt-1" checked={current[key] === 'on'} onChange={(e) => setValues({ ...current, [key]: e.target.checked ? 'on' : '' })} />
                  <span>{STRESS_LABELS[kind]}</span>
                </label>
                {current[key] === 'on' && kind === 'delay-sensitivity' ? (
                  <div className="grid grid-cols-2 gap-2">
                    <TextField label="Lowest s" inputMode="decimal" value={current.stressLow} onChange={set('stressLow')} error={err(`stress.${i}.low`)} />
                    <TextField label="Highest s" inputMode="decimal" value={current.stressHigh} onChange={set('stressHigh')} error={err(`stress.${i}.high`)} />
                  </div>
                ) : null}
                {current[key] === 'on' && kind === 'present-bias' ? <TextField label="Present bias β" inputMode="decimal" value={current.stressBeta} onChange={set('stressBeta')} error={err(`stress.${i}.beta`)} /> : null}
                {current[key] === 'on' && kind === 'choice-noise' ? <TextField label="γ factor" inputMode="decimal" value={current.stressFactor} onChange={set('stressFactor')} error={err(`stress.${i}.factor`)} /> : null}
              </div>
            );
          })}
        </div>
        <label className="flex items-start gap-2 text-sm">
          <input type="checkbox" className="mt-1" checked={current.compareCalibration === 'on'} onChange={(e) => setValues({ ...current, compareCalibration: e.target.checked ? 'on' : '' })} />
          <span>
            Also simulate the other calibration under every truth: calibration delays spanning the probes with delay sensitivity estimated in stage 1 (or, for a design that already does so, the
            plain calibration block), to see what it buys when s is below 1.
          </span>
        </label>
        {err('compareCalibration') ? <p role="alert" className="text-xs text-danger-700">{err('compareCalibration')}</p> : null}
      </fieldset>
      <fieldset className="space-y-3">
        <legend className="text-sm font-semibold">Test and simulation</legend>
        <div className="grid gap-4 sm:grid-cols-3">
          <SelectField label="Test" value={current.test} onChange={set('test')} error={err('test.kind')}>
            {POWER_TESTS.map((t) => (
              <option key={t} value={t}>
                {POWER_TEST_LABELS[t]}
              </option>
            ))}
          </SelectField>
          <TextField label="α" inputMode="decimal" value={current.alpha} onChange={set('alpha')} error={err('test.alpha')} />
          <SelectField label="Sidedness" value={current.alternative} onChange={set('alternative')}>
            <option value="greater">One-sided: more LS than SL</option>
            <option value="two-sided">Two-sided</option>
          </SelectField>
        </div>
        <div className="grid gap-4 sm:grid-cols-3">
          <TextField label="Sample sizes" value={current.sizes} onChange={set('sizes')} error={err('sampleSizes')} hint="e.g. 20, 40, 60 or 20:200:20" />
          <TextField label="Replications" inputMode="numeric" value={current.replications} onChange={set('replications')} error={err('replications')} />
          <TextField label="Seed" inputMode="numeric" value={current.seed} onChange={set('seed')} error={err('seed')} />
        </div>
      </fieldset>
      {start.error && !(start.error instanceof ApiClientError && start.error.issues.length) ? <Notice tone="error">{start.error.message}</Notice> : null}
      <Button type="submit" disabled={start.isPending}>
        {start.isPending ? 'Starting…' : 'Start simulation'}
      </Button>
    </form>
  );
}
