// Whether the design form holds unsaved edits is read from its values against the saved spec.
import { describe, expect, it } from 'vitest';
import { defaultSpec, hasUnsavedEdits, toForm } from '@/lib/shared/planner/design-form-values';

const saved = defaultSpec('Draft', 3);

describe('unsaved edits of the design form', () => {
  it('are none for the saved spec as the form holds it, whatever the key order', () => {
    expect(hasUnsavedEdits(toForm(saved), saved)).toBe(false);
    const reordered = Object.fromEntries(Object.entries(toForm(saved)).reverse()) as ReturnType<typeof toForm>;
    expect(hasUnsavedEdits(reordered, saved)).toBe(false);
  });

  it('are there after one changed number, text or option, and for an emptied number field', () => {
    expect(hasUnsavedEdits({ ...toForm(saved), largeAmount: 321 }, saved)).toBe(true);
    expect(hasUnsavedEdits({ ...toForm(saved), name: 'Draft 2' }, saved)).toBe(true);
    expect(hasUnsavedEdits({ ...toForm(saved), soonDelay: { ...toForm(saved).soonDelay, mode: 'optimised' } }, saved)).toBe(true);
    expect(hasUnsavedEdits({ ...toForm(saved), ratio: Number.NaN }, saved)).toBe(true);
  });

  it('ignore controls the chosen options do not use (nothing of them would be saved)', () => {
    const form = toForm(saved); // soon delay fixed: its range bounds are not part of the spec
    expect(hasUnsavedEdits({ ...form, soonDelay: { ...form.soonDelay, min: 2, max: 90 } }, saved)).toBe(false);
    expect(hasUnsavedEdits({ ...form, model: { ...form.model, sensitivity: 0.5 } }, saved)).toBe(false); // hyperbolic has no s
  });

  it('return to none when an edit is typed back', () => {
    expect(hasUnsavedEdits({ ...toForm(saved), largeAmount: saved.largeAmount }, saved)).toBe(false);
  });
});
