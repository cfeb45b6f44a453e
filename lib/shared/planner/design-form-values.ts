import { z } from 'zod';
import { designSpecSchema, type DesignSpec } from '@/lib/shared/validations/planner';
import { DEFAULT_ADAPTIVE_STOP } from '@/lib/design';
import { DEFAULT_CHOICE_SENSITIVITY } from './types';

/**
 * What the design form holds: every control has a value at all times (the soon-delay bounds
 * while "fixed" is chosen, s and β while another model is chosen), so switching back and forth
 * loses nothing. `toSpec` keeps only what the chosen options use; the zod issue paths of the
 * spec are the same as the form's field names.
 */
export type DesignFormValues = Omit<DesignSpec, 'model' | 'soonDelay' | 'choiceSensitivity' | 'calibration' | 'reversalWeight'> & {
  model: { id: DesignSpec['model']['id']; sensitivity: number; presentBias: number };
  calibration: Omit<DesignSpec['calibration'], 'adaptive' | 'placement' | 'fit'> & {
    adaptive: { enabled: boolean; maxItems: number; targetSd: number };
    placement: NonNullable<DesignSpec['calibration']['placement']>;
    fit: NonNullable<DesignSpec['calibration']['fit']>;
  };
  soonDelay: { mode: 'fixed' | 'optimised'; days: number; min: number; max: number };
  choiceSensitivity: number;
  /** the model-discrimination criterion's reversal weight (kept while another criterion is chosen) */
  reversalWeight: number;
};

const USES_S = new Set(['hyperboloid', 'power-delay', 'exponential-power']);

/** The spec a form's values stand for (not yet validated). */
export function toSpec(v: DesignFormValues): DesignSpec {
  const model: DesignSpec['model'] = { id: v.model.id };
  if (USES_S.has(v.model.id)) model.sensitivity = v.model.sensitivity;
  if (v.model.id === 'quasi-hyperbolic') model.presentBias = v.model.presentBias;
  const soonDelay: DesignSpec['soonDelay'] = v.soonDelay.mode === 'fixed' ? { mode: 'fixed', days: v.soonDelay.days } : { mode: 'optimised', min: v.soonDelay.min, max: v.soonDelay.max };
  // the defaults are left out, so a design that does not use the options keeps the spec (and hash) it had before them
  const { adaptive, placement, fit, ...fixedBlock } = v.calibration;
  const calibration: DesignSpec['calibration'] = {
    ...fixedBlock,
    ...(adaptive.enabled ? { adaptive: { maxItems: adaptive.maxItems, targetSd: adaptive.targetSd } } : {}),
    ...(placement !== 'range' ? { placement } : {}),
    ...(fit !== 'design-model' ? { fit } : {}),
  };
  const { reversalWeight, ...rest } = v;
  return { ...rest, model, soonDelay, calibration, choiceSensitivity: v.choiceSensitivity, ...(v.criterion === 'model-discrimination' ? { reversalWeight } : {}) };
}

/** Form values for a stored spec, with defaults for the controls the spec does not use. */
export function toForm(spec: DesignSpec): DesignFormValues {
  const soon = spec.soonDelay;
  return {
    ...spec,
    model: { id: spec.model.id, sensitivity: spec.model.sensitivity ?? 1, presentBias: spec.model.presentBias ?? 0.9 },
    soonDelay: soon.mode === 'fixed' ? { mode: 'fixed', days: soon.days, min: Math.max(1, Math.min(soon.days, 7)), max: Math.max(soon.days, 60) } : { mode: 'optimised', days: soon.min, min: soon.min, max: soon.max },
    choiceSensitivity: spec.choiceSensitivity ?? DEFAULT_CHOICE_SENSITIVITY,
    reversalWeight: spec.reversalWeight ?? 0,
    calibration: {
      ...spec.calibration,
      adaptive: spec.calibration.adaptive ? { enabled: true, ...spec.calibration.adaptive } : { enabled: false, ...DEFAULT_ADAPTIVE_STOP },
      placement: spec.calibration.placement ?? 'range',
      fit: spec.calibration.fit ?? 'design-model',
    },
  };
}

/** The form's schema: the design schema itself, applied to the spec the values stand for. */
export const designFormSchema = z.preprocess((v: DesignFormValues) => toSpec(v), designSpecSchema);

/** A sensible first draft for a new design on a prior set. */
export function defaultSpec(name: string, priorSetId: number): DesignSpec {
  return {
    name,
    priorSetId,
    model: { id: 'hyperbolic' },
    ratio: 0.6,
    largeAmount: 100,
    currency: 'EUR',
    mode: 'personalised',
    soonDelay: { mode: 'fixed', days: 14 },
    lateDelayLimit: 730,
    probePairs: 4,
    lateAnchors: 2,
    soonAnchors: 2,
    criterion: 'gap-product',
    calibration: { itemsPerMagnitude: 10, minDelay: 7, maxDelay: 365 },
    choiceSensitivity: DEFAULT_CHOICE_SENSITIVITY,
  };
}

/** Whether two plain values (objects, arrays, numbers, text) are the same, whatever the key order; NaN equals nothing. */
function sameValue(a: unknown, b: unknown): boolean {
  if (a === b) return true;
  if (typeof a !== 'object' || typeof b !== 'object' || a === null || b === null) return false;
  if (Array.isArray(a) !== Array.isArray(b)) return false;
  const keysA = Object.keys(a).filter((k) => (a as Record<string, unknown>)[k] !== undefined);
  const keysB = Object.keys(b).filter((k) => (b as Record<string, unknown>)[k] !== undefined);
  return keysA.length === keysB.length && keysA.every((k) => sameValue((a as Record<string, unknown>)[k], (b as Record<string, unknown>)[k]));
}

/**
 * Whether the form holds edits the saved design does not have: the spec the values stand for
 * against the saved spec, both read through the same toForm/toSpec round trip (so controls the
 * chosen options do not use are not edits). Read from the values themselves, never from the
 * form library's dirty flag, which a reset under a just-typed edit can clear.
 * @example hasUnsavedEdits(toForm(spec), spec) === false
 */
export function hasUnsavedEdits(values: DesignFormValues, saved: DesignSpec): boolean {
  return !sameValue(toSpec(values), toSpec(toForm(saved)));
}
