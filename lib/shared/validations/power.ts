import { z } from 'zod';
import '@/lib/shared/validations/error-map';
import { designChoiceModel } from '@/lib/design/designChoiceModel';
import { nameText } from '@/lib/shared/validations/text';
import { modelSpecSchema, priorValuesSchema, type FrozenDesign } from './planner';

/**
 * A power run's specification, saved with the run: which frozen design, the simulated truth,
 * the calibration treatment, the test, the sample sizes, replications and seed. Shared by the
 * new-run form (zodResolver) and the route handler (readJson).
 */
export const POWER_TESTS = ['sign', 'sign-flip', 'probes-vs-anchors', 'mcnemar'] as const;
/** The test a new run starts with: participant level, so a person's several probe pairs count once. */
export const DEFAULT_POWER_TEST: (typeof POWER_TESTS)[number] = 'sign';
export const POWER_TEST_LABELS: Record<(typeof POWER_TESTS)[number], string> = {
  sign: 'Sign test at the participant level (LS − SL per participant)',
  'sign-flip': 'Sign-flip permutation test at the participant level (sum of LS − SL)',
  'probes-vs-anchors': 'LS rate in probes vs anchors (participant-level sign test)',
  mcnemar: 'Exact McNemar test, pooled over participants (assumes independent pairs)',
};

/** The warning the page and the figure carry for a test whose assumption a reviewer would question; null when none. */
export function testWarning(kind: (typeof POWER_TESTS)[number]): string | null {
  return kind === 'mcnemar' ? 'Pooled McNemar test assumes independent pairs; a person’s pairs are not, so this power may be optimistic.' : null;
}

export const MAX_SAMPLE_SIZE = 5000;
export const MAX_REPLICATIONS = 20000;

export const powerTruthSchema = z.strictObject({
  model: modelSpecSchema,
  prior: priorValuesSchema,
  gamma: z.number({ error: 'Choice sensitivity γ must be a number.' }).gt(0, 'Choice sensitivity γ must be above 0.').max(1000, 'Choice sensitivity γ must be at most 1000.'),
  lapse: z.number({ error: 'Lapse rate ε must be a number.' }).min(0, 'Lapse rate ε must be 0 or more.').max(0.5, 'Lapse rate ε must be at most 0.5.'),
});

/**
 * The truth a new run starts from for a frozen version: the design's model, prior and its one
 * choice sensitivity γ (designChoiceModel), with a small lapse rate as a planning assumption.
 * The new-run form shows these values; the user changes them to simulate another truth.
 */
export function assumedTruth(content: Pick<FrozenDesign, 'spec' | 'prior'>): PowerTruthValues {
  const { name: _name, ...prior } = content.prior;
  return { model: content.spec.model, prior, gamma: designChoiceModel(content.spec).sensitivity, lapse: DEFAULT_LAPSE };
}

/** Lapse rate ε a new run's truth starts with (common practice: a few per cent of choices at random). */
export const DEFAULT_LAPSE = 0.02;

export type PowerTruthValues = z.infer<typeof powerTruthSchema>;

/** One stress truth of a run (lib/design/power/stressTruth): a named deviation from the assumed truth. */
export const stressTruthSchema = z.discriminatedUnion('kind', [
  z.strictObject({
    kind: z.literal('delay-sensitivity'),
    low: z.number({ error: 'The lowest delay sensitivity must be a number.' }).gt(0, 'The lowest delay sensitivity must be above 0.').max(1, 'The lowest delay sensitivity must be at most 1.'),
    high: z.number({ error: 'The highest delay sensitivity must be a number.' }).gt(0, 'The highest delay sensitivity must be above 0.').max(1, 'The highest delay sensitivity must be at most 1.'),
  }),
  z.strictObject({ kind: z.literal('no-magnitude-effect') }),
  z.strictObject({ kind: z.literal('present-bias'), beta: z.number({ error: 'Present bias β must be a number.' }).gt(0, 'Present bias β must be above 0.').lt(1, 'Present bias β must be below 1.') }),
  z.strictObject({ kind: z.literal('choice-noise'), factor: z.number({ error: 'The γ factor must be a number.' }).gt(0, 'The γ factor must be above 0.').lt(1, 'The γ factor must be below 1.') }),
  z.strictObject({ kind: z.literal('other-model') }),
]);
export type StressTruthValues = z.infer<typeof stressTruthSchema>;

/** Labels of the stress truths in the new-run form. */
export const STRESS_LABELS: Record<StressTruthValues['kind'], string> = {
  'delay-sensitivity': 'Delay sensitivity below 1, drawn per participant',
  'no-magnitude-effect': 'No magnitude effect (K = k)',
  'present-bias': 'Present bias β on every delayed value',
  'choice-noise': 'Noisier choices (γ times a factor)',
  'other-model': 'The other model (exponential ↔ hyperbolic)',
};

/** Below this many replications the page and the method paragraph show the Monte Carlo error. */
export const MONTE_CARLO_NOTE_BELOW = 1000;

export const powerRunSpecSchema = z
  .strictObject({
    designVersionId: z.number({ error: 'Choose a frozen design version.' }).int().positive('Choose a frozen design version.'),
    label: nameText({ label: 'The label', min: 0, max: 120, tooLong: 'Keep the label under 120 characters.' }).default(''),
    truth: powerTruthSchema,
    calibration: z.enum(['simulated', 'adaptive', 'known']),
    /** stress truths simulated beside the assumed one; absent in runs saved before they existed */
    stress: z.array(stressTruthSchema).max(5, 'Add at most five stress truths.').default([]),
    /** also simulate the design with its other calibration (calibrationVariant) under every truth; absent in older runs */
    compareCalibration: z.boolean({ error: 'Say true or false for comparing calibrations.' }).optional(),
    test: z.strictObject({
      kind: z.enum(POWER_TESTS),
      alpha: z.number().gt(0, 'α must be above 0.').max(0.5, 'α must be at most 0.5.'),
      alternative: z.enum(['greater', 'two-sided']),
    }),
    sampleSizes: z
      .array(z.number().int('Sample sizes are whole numbers.').min(1, 'Sample sizes start at 1.').max(MAX_SAMPLE_SIZE, `Sample sizes are at most ${MAX_SAMPLE_SIZE}.`))
      .min(1, 'List at least one sample size.')
      .max(40, 'List at most 40 sample sizes.'),
    replications: z.number().int('Replications are a whole number.').min(10, 'Use at least 10 replications.').max(MAX_REPLICATIONS, `Use at most ${MAX_REPLICATIONS} replications.`),
    seed: z.number().int('The seed is a whole number.').min(0, 'The seed is 0 or more.').max(2147483647, 'The seed is at most 2147483647.'),
  })
  .superRefine((spec, ctx) => {
    const kinds = new Set<string>();
    spec.stress.forEach((stress, i) => {
      if (kinds.has(stress.kind)) ctx.addIssue({ code: 'custom', path: ['stress', i, 'kind'], message: 'Add each stress truth once.' });
      kinds.add(stress.kind);
      if (stress.kind === 'delay-sensitivity' && stress.high < stress.low) {
        ctx.addIssue({ code: 'custom', path: ['stress', i, 'high'], message: 'The highest delay sensitivity must be at least the lowest.' });
      }
    });
    if (spec.compareCalibration === true && spec.calibration !== 'simulated')
      ctx.addIssue({ code: 'custom', path: ['compareCalibration'], message: 'Comparing calibrations needs a simulated calibration block.' });
    spec.sampleSizes.forEach((n, i) => {
      if (i > 0 && n <= spec.sampleSizes[i - 1]) ctx.addIssue({ code: 'custom', path: ['sampleSizes', i], message: 'List sample sizes in increasing order, each once.' });
    });
  });
export type PowerRunSpec = z.infer<typeof powerRunSpecSchema>;
export type PowerRunSpecInput = z.input<typeof powerRunSpecSchema>;

/** Starting a run: the spec (a run always starts at once). */
export const createPowerRunSchema = powerRunSpecSchema;

/** Statuses of a saved run. */
export const POWER_STATUSES = ['queued', 'running', 'finished', 'cancelled', 'interrupted', 'failed'] as const;
export type PowerStatus = (typeof POWER_STATUSES)[number];

/** Parses "20, 40, 60" or "20:200:20" (start:end:step) into sample sizes; null when malformed. */
export function parseSampleSizes(text: string): number[] | null {
  const range = /^\s*(\d+)\s*:\s*(\d+)\s*:\s*(\d+)\s*$/.exec(text);
  if (range) {
    const [start, end, step] = range.slice(1).map(Number);
    if (step <= 0 || end < start || (end - start) / step > 40) return null;
    const sizes: number[] = [];
    for (let n = start; n <= end; n += step) sizes.push(n);
    return sizes;
  }
  const parts = text.split(/[\s,;]+/).filter(Boolean);
  if (parts.length === 0 || parts.some((p) => !/^\d+$/.test(p))) return null;
  return parts.map(Number);
}
