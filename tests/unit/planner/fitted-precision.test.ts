import { describe, expect, it } from 'vitest';
import { rememberFit, restoreExact, shownValue } from '@/lib/shared/planner/fitted-precision';

describe('fitted prior values: readable in the fields, exact when saved', () => {
  const exact = { medianSmall: 0.021346780122334455, medianLarge: 0.0089123456789, sdLogSmall: 0.80000000000000004, correlation: -0.612345678901 };

  it('shows four significant digits', () => {
    expect(shownValue(exact.medianSmall)).toBe(0.02135);
    expect(shownValue(exact.correlation)).toBe(-0.6123);
    expect(String(shownValue(exact.medianLarge))).toBe('0.008912');
  });

  it('saves the exact value of every field left as shown, and what the user typed elsewhere', () => {
    const fit = rememberFit(exact);
    const typed = { name: 'Pilot', medianSmall: 0.02135, medianLarge: 0.009, sdLogSmall: 0.8, correlation: -0.6123 };
    expect(restoreExact(typed, fit)).toEqual({ name: 'Pilot', medianSmall: exact.medianSmall, medianLarge: 0.009, sdLogSmall: exact.sdLogSmall, correlation: exact.correlation });
  });

  it('leaves values alone when nothing was fitted', () => {
    expect(restoreExact({ medianSmall: 0.02 }, {})).toEqual({ medianSmall: 0.02 });
  });
});
