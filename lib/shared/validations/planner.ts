import { z } from 'zod';
import '@/lib/shared/validations/error-map';
import { freeText, nameText } from '@/lib/shared/validations/text';
import { amountUnit, roundTo } from '@/lib/design/item-bank/rounding';

/**
 * The planner's entities, one zod schema each, shared by forms (zodResolver), route handlers
 * (safeParse) and the frozen-version snapshot. Units: rates per day, delays in days.
 */

export const MODEL_CHOICES = ['exponential', 'hyperbolic', 'hyperboloid', 'power-delay', 'exponential-power', 'quasi-hyperbolic'] as const;

export const MAX_LATE_DELAY_DAYS = 9131; // 25 years

const rate = (label: string) =>
  z.number({ error: `${label} must be a number (per day).` }).positive(`${label} must be above 0 per day.`).max(10, `${label} must be at most 10 per day.`);

/** A named prior over (ln kSmall, ln kLarge): medians, spreads (SD of ln k) and their correlation. */
export const priorValuesSchema = z.strictObject({
  medianSmall: rate('Median rate for the small reward'),
  medianLarge: rate('Median rate for the large reward'),
  sdLogSmall: z.number().min(0, 'Spread must be 0 or more.').max(5, 'Spread must be at most 5 (SD of ln k).'),
  sdLogLarge: z.number().min(0, 'Spread must be 0 or more.').max(5, 'Spread must be at most 5 (SD of ln k).'),
  correlation: z.number().min(-0.99, 'Correlation must be between −0.99 and 0.99.').max(0.99, 'Correlation must be between −0.99 and 0.99.'),
});
export type PriorValues = z.infer<typeof priorValuesSchema>;

export const priorSetSchema = z.strictObject({
  name: nameText({ label: 'The prior set name', min: 1, max: 120, tooShort: 'Name the prior set.' }),
  ...priorValuesSchema.shape,
  source: z.enum(['manual', 'pilot']).default('manual'),
  notes: freeText({ label: 'The notes', max: 2000, trim: false }).default(''),
});
export type PriorSetInput = z.input<typeof priorSetSchema>;

export const modelSpecSchema = z.strictObject({
  id: z.enum(MODEL_CHOICES),
  // Below 0.01 the delay term t^s changes by under 10 % from 1 day to 25 years: the model no longer
  // discounts by delay, and the optimiser's numbers stop being meaningful (planner bound).
  sensitivity: z.number().min(0.01, 'Delay sensitivity s must be at least 0.01.').max(5, 'Delay sensitivity s must be at most 5.').optional(),
  presentBias: z.number().gt(0, 'Present bias β must be above 0.').max(1, 'Present bias β must be at most 1.').optional(),
});

export const soonDelaySchema = z.discriminatedUnion('mode', [
  z.strictObject({ mode: z.literal('fixed'), days: z.number().int().min(0).max(365, 'The soon delay must be at most 365 days.') }),
  z.strictObject({
    mode: z.literal('optimised'),
    min: z.number().int().min(0).max(365),
    max: z.number().int().min(0).max(365, 'The soon delay must be at most 365 days.'),
  }),
]);

/** Where the calibration block's later delays go (absent in designs saved before the option: 'range'). */
export const CALIBRATION_PLACEMENT_CHOICES = ['range', 'span-probes'] as const;
/** The model stage 1 fits (absent: 'design-model'); the others estimate delay sensitivity s as well. */
export const STAGE_ONE_FIT_CHOICES = ['design-model', 'hyperboloid', 'power-delay', 'exponential-power'] as const;

export const calibrationSchema = z.strictObject({
  itemsPerMagnitude: z.number().int().min(4, 'Use at least 4 calibration items per magnitude.').max(40, 'Use at most 40 calibration items per magnitude.'),
  minDelay: z.number().int().min(1).max(MAX_LATE_DELAY_DAYS),
  maxDelay: z.number().int().min(1).max(MAX_LATE_DELAY_DAYS),
  /**
   * Adaptive calibration (adaptive design optimisation): items chosen one at a time by expected
   * information from a candidate set over the same delays; absent = the fixed block.
   */
  adaptive: z
    .strictObject({
      maxItems: z.number().int().min(2, 'Ask at least 2 adaptive calibration items.').max(80, 'Ask at most 80 adaptive calibration items.'),
      targetSd: z.number().min(0, 'The target SD of ln k must be 0 or more.').max(2, 'The target SD of ln k must be at most 2.'),
    })
    .optional(),
  // calibration that covers the probes (issue 15): optional, so versions frozen before keep their hash
  placement: z.enum(CALIBRATION_PLACEMENT_CHOICES, { error: "Choose 'range' or 'span-probes' for the calibration delays." }).optional(),
  fit: z.enum(STAGE_ONE_FIT_CHOICES, { error: 'Choose the design model, hyperboloid, power-delay or exponential-power for stage 1.' }).optional(),
});

/** What a design's probe delays maximise; 'model-discrimination' tells the hyperbolic and exponential models apart. */
export const CRITERION_CHOICES = ['gap-product', 'expected-reversal-rate', 'maximin', 'model-discrimination'] as const;

/** The fields a user edits on a candidate design. */
export const designSpecSchema = z
  .strictObject({
    name: nameText({ label: 'The design name', min: 1, max: 120, tooShort: 'Name the design.' }),
    priorSetId: z.number().int().positive('Choose a prior set.'),
    model: modelSpecSchema,
    ratio: z.number().gt(0, 'The magnitude ratio S/L must be above 0.').lt(1, 'The magnitude ratio S/L must be below 1.'),
    largeAmount: z.number().positive('The large amount must be above 0.').max(1_000_000),
    currency: z.string().trim().regex(/^[A-Z]{3}$/, 'Use a three-letter currency code such as EUR.'),
    mode: z.enum(['personalised', 'population']),
    soonDelay: soonDelaySchema,
    lateDelayLimit: z.number().int().min(2).max(MAX_LATE_DELAY_DAYS, 'The late delay is limited to 25 years (9131 days).'),
    probePairs: z.number().int().min(1, 'Use at least 1 probe pair.').max(20),
    lateAnchors: z.number().int().min(0).max(10),
    soonAnchors: z.number().int().min(0).max(10),
    criterion: z.enum(CRITERION_CHOICES, { error: "Choose 'gap-product', 'expected-reversal-rate', 'maximin' or 'model-discrimination' as the criterion." }),
    /** model discrimination: weight of the reversal term beside the models' divergence (0 = pure discrimination); absent = 0, so older versions keep their hash */
    reversalWeight: z.number().min(0, 'The reversal weight must be 0 or more.').max(100, 'The reversal weight must be at most 100.').optional(),
    calibration: calibrationSchema,
    /** logistic choice sensitivity γ per unit of the large amount, for expected rates; the planner assumes 20 when absent */
    choiceSensitivity: z.number().positive('Choice sensitivity γ must be above 0.').max(1000, 'Choice sensitivity γ must be at most 1000.').optional(),
  })
  .superRefine((spec, ctx) => {
    const beta = spec.model.id === 'quasi-hyperbolic' ? spec.model.presentBias : undefined;
    if (beta !== undefined && spec.ratio > 0 && spec.ratio < 1 && spec.largeAmount > 0 && /^[A-Z]{3}$/.test(spec.currency)) {
      // the calibration block asks "c today or S later" with c at least one amount unit; under quasi-hyperbolic
      // discounting S later is worth at most β·S today, so β·S ≤ one unit leaves no question with an indifference point
      const unit = amountUnit({ currency: spec.currency, largeAmount: spec.largeAmount, smallAmount: spec.ratio * spec.largeAmount });
      const small = roundTo(spec.ratio * spec.largeAmount, unit);
      // (amounts below one unit are their own problem, not β's: left to the amount checks downstream)
      if (small > unit && !(beta * small > unit))
        ctx.addIssue({
          code: 'custom',
          path: ['model', 'presentBias'],
          message: `With present bias β = ${beta}, the small later reward (${small} ${spec.currency}) would be worth at most ${Number((beta * small).toPrecision(3))} ${spec.currency} today, not more than the smallest amount a question can offer (${unit} ${spec.currency}): no choice could reveal a discount rate. Use β above ${Number((unit / small).toPrecision(3))} or larger amounts.`,
        });
    }
    if (spec.soonDelay.mode === 'optimised' && spec.soonDelay.min > spec.soonDelay.max)
      ctx.addIssue({ code: 'custom', path: ['soonDelay', 'max'], message: 'The upper bound must not be below the lower bound.' });
    if (spec.calibration.minDelay >= spec.calibration.maxDelay)
      ctx.addIssue({ code: 'custom', path: ['calibration', 'maxDelay'], message: 'The longest calibration delay must exceed the shortest.' });
    if ((spec.calibration.fit ?? 'design-model') !== 'design-model' && (spec.calibration.placement ?? 'range') !== 'span-probes')
      ctx.addIssue({
        code: 'custom',
        path: ['calibration', 'fit'],
        message: 'Estimating delay sensitivity needs calibration delays that span the probes: with one delay per rate, s and k cannot be told apart.',
      });
    if ((spec.calibration.fit ?? 'design-model') !== 'design-model' && spec.calibration.adaptive)
      ctx.addIssue({ code: 'custom', path: ['calibration', 'fit'], message: 'Adaptive calibration estimates rates its own way: choose the design model for stage 1, or the fixed block.' });
    if ((spec.calibration.fit ?? 'design-model') !== 'design-model' && spec.mode !== 'personalised')
      ctx.addIssue({ code: 'custom', path: ['calibration', 'fit'], message: 'Only a personalised design builds probes from stage-1 estimates.' });
    if (spec.reversalWeight !== undefined && spec.criterion !== 'model-discrimination')
      ctx.addIssue({ code: 'custom', path: ['reversalWeight'], message: 'The reversal weight belongs to the model-discrimination criterion: remove it or choose that criterion.' });
    const soonest = spec.soonDelay.mode === 'fixed' ? spec.soonDelay.days : spec.soonDelay.max;
    if (spec.lateDelayLimit <= soonest)
      ctx.addIssue({ code: 'custom', path: ['lateDelayLimit'], message: 'The late-delay limit must exceed the soon delay.' });
  });
export type DesignSpec = z.infer<typeof designSpecSchema>;
export type DesignSpecInput = z.input<typeof designSpecSchema>;

/** Saving a design names the version it was based on (optimistic locking, 409 when stale). */
export const designUpdateSchema = z.strictObject({ spec: designSpecSchema, version: z.number().int().positive() });

/**
 * What a frozen version stores and hashes: the spec with its prior's values copied in, so an
 * export or a power run citing the hash never depends on a prior set edited later.
 */
export const frozenDesignSchema = z.strictObject({
  spec: designSpecSchema,
  prior: priorValuesSchema.extend({ name: z.string() }),
});
export type FrozenDesign = z.infer<typeof frozenDesignSchema>;

export const commentSchema = z.strictObject({ text: freeText({ label: 'The comment', max: 4000 }).min(1, 'Write something first.') });

/** Editing a prior set names the version it was based on (optimistic locking, 409 when stale). */
export const priorSetUpdateSchema = z.strictObject({ prior: priorSetSchema, version: z.number().int().positive() });
export type PriorSetUpdate = z.input<typeof priorSetUpdateSchema>;

/** Query of a pilot upload: the model raw pilot choices are estimated under (files of per-person rates ignore it). */
export const pilotQuerySchema = z.strictObject({ model: z.enum(MODEL_CHOICES).default('hyperbolic') });

/** Pilot-data upload limits: bigger files are refused before parsing. */
export const PILOT_MAX_BYTES = 5 * 1024 * 1024;
export const PILOT_MAX_ROWS = 100_000;
