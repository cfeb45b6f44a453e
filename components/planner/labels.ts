import type { DesignSpec } from '@/lib/shared/validations/planner';

export const MODEL_LABELS: Record<DesignSpec['model']['id'], string> = {
  exponential: 'Exponential',
  hyperbolic: 'Hyperbolic (Mazur)',
  hyperboloid: 'Hyperboloid (Myerson & Green)',
  'power-delay': 'Power-delay hyperbola (Rachlin)',
  'exponential-power': 'Exponential with delay sensitivity',
  'quasi-hyperbolic': 'Quasi-hyperbolic (β–δ)',
};

export const CRITERION_LABELS: Record<DesignSpec['criterion'], string> = {
  'gap-product': 'Gap product',
  'expected-reversal-rate': 'Expected reversal rate',
  maximin: 'Maximin gap',
  'model-discrimination': 'Model discrimination',
};

/** The glossary entry explaining each criterion. */
export const CRITERION_TERMS: Record<DesignSpec['criterion'], string> = {
  'gap-product': 'gap-product',
  'expected-reversal-rate': 'expected-reversal-rate',
  maximin: 'maximin-gap',
  'model-discrimination': 'model-discrimination',
};

export const ROLE_LABELS = { 'late-anchor': 'Late anchor', probe: 'Reversal probe', 'soon-anchor': 'Soon anchor' } as const;

/** The stage-1 model choices of a design's calibration block. */
export const STAGE_ONE_FIT_LABELS: Record<NonNullable<DesignSpec['calibration']['fit']>, string> = {
  'design-model': 'The design model (delay sensitivity fixed)',
  hyperboloid: 'Hyperboloid, s estimated',
  'power-delay': 'Power-delay hyperbola, s estimated',
  'exponential-power': 'Exponential with delay sensitivity, s estimated',
};
