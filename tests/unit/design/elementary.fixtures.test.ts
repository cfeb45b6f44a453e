import { describe, expect, it } from 'vitest';
import { expm1Of, expOf, HIGH_WORD, highWord, lnHalfOnePlus, logOf } from '@/lib/design/elementary';
import * as tables from '@/lib/design/elementaryTables';
import fixture from './fixtures/elementary/elementary.json';

// Reference values: tests/unit/design/fixtures/elementary/generate.py (mpmath at 50 digits, rounded once to
// the nearest double), swept over each routine's whole range: the table range and both sides of its
// edges, every octave of the doubles for ln, tiny arguments, and the points halfway between table entries.
// Errors are counted in units in the last place (ulp) of the reference value.

/** The spacing of the doubles at v (for a power of two, the spacing above it). */
function ulp(v: number): number {
  const a = Math.abs(v);
  if (a < 2 ** -1022) return 2 ** -1074;
  let e = Math.floor(Math.log2(a));
  if (2 ** e > a) e -= 1;
  if (2 ** (e + 1) <= a) e += 1;
  return 2 ** (e - 52);
}

const errorInUlps = (got: number, want: number) => (got === want ? 0 : Math.abs(got - want) / ulp(want));
const sweeps: [string, (v: number) => number, [number, number][]][] = [
  ['expOf', expOf, fixture.exp as [number, number][]],
  ['expm1Of', expm1Of, fixture.expm1 as [number, number][]],
  ['logOf', (u) => logOf(u, highWord(u)), fixture.log as [number, number][]],
  ['lnHalfOnePlus', lnHalfOnePlus, fixture.lnHalfOnePlus as [number, number][]],
];

describe('table routines against 50-digit values over their whole range', () => {
  for (const [name, routine, pairs] of sweeps) {
    it(`${name} is within one ulp of the correctly rounded value at each of ${pairs.length} points`, () => {
      // measured worst case: exactly one ulp (the double on the other side of the true value), the
      // accuracy of the engine's own Math routines on the same points
      let worst = 0;
      let worstAt = NaN;
      let exact = 0;
      for (const [argument, want] of pairs) {
        const error = errorInUlps(routine(argument), want);
        if (error > worst) [worst, worstAt] = [error, argument];
        if (error === 0) exact += 1;
      }
      expect(worst, `${name} worst at ${worstAt}`).toBeLessThanOrEqual(1);
      // most points are correctly rounded: the table's double-double values leave only the last rounding
      expect(exact / pairs.length, name).toBeGreaterThan(0.95);
    });
  }

  it('keeps relative accuracy where the result is tiny: e^t − 1 and ln(1 + m/2) for |t|, |m| down to 1e-300', () => {
    // to first order e^t − 1 = t and ln(1 + m/2) = m/2, the next terms are below 1e-300 relative
    for (const t of [1e-300, -1e-300, 1e-20, -3e-17]) expect(expm1Of(t)).toBe(t);
    for (const m of [-1e-300, -2e-20, -4e-17]) expect(lnHalfOnePlus(m)).toBe(m / 2);
    expect(lnHalfOnePlus(0)).toBe(0);
    expect(lnHalfOnePlus(-1)).toBe(-Math.LN2);
    // ln(1 + 2^-52) = 2^-52 − 2^-105 + 2^-156/3 − …, and 2^-52 − 2^-105 is a double (the spacing below
    // 2^-52 is 2^-105); ln(1 − 2^-53) = −2^-53 − 2^-107 − …, nearest −2^-53 (the spacing above 2^-53 is 2^-105)
    expect(logOf(1 + 2 ** -52, highWord(1 + 2 ** -52))).toBe(2 ** -52 - 2 ** -105);
    expect(logOf(1 - 2 ** -53, highWord(1 - 2 ** -53))).toBe(-(2 ** -53));
    expect(logOf(1, highWord(1))).toBe(0);
  });

  it('hands the arguments outside the table range to Math: overflow, underflow, subnormal and non-finite inputs', () => {
    // IEEE 754: e^t overflows above ln(2^1024) ≈ 709.78 and is 0 below ln(2^-1075) ≈ −745.13
    expect(expOf(710)).toBe(Infinity);
    expect(expOf(-746)).toBe(0);
    expect(expOf(-Infinity)).toBe(0);
    expect(expm1Of(-Infinity)).toBe(-1);
    expect(expm1Of(800)).toBe(Infinity);
    expect(Number.isNaN(expOf(NaN)) && Number.isNaN(expm1Of(NaN))).toBe(true);
    const log = (u: number) => logOf(u, highWord(u));
    expect(log(0)).toBe(-Infinity);
    expect(log(Infinity)).toBe(Infinity);
    expect(Number.isNaN(log(-1)) && Number.isNaN(log(NaN))).toBe(true);
    expect(log(5e-324)).toBe(Math.log(5e-324));
    // outside [−1, 0], ln(1 + m/2) is Math.log1p(m/2)
    expect(lnHalfOnePlus(0.5)).toBe(Math.log1p(0.25));
    expect(Number.isNaN(lnHalfOnePlus(-3))).toBe(true);
  });
});

describe('highWord and the tables', () => {
  it('reads the sign, exponent and top significand bits, as a Uint32Array over a Float64Array does', () => {
    // IEEE 754 binary64 layouts: 1 = 0x3ff0000000000000, −2 = 0xc000000000000000, 0.1 = 0x3fb999999999999a
    expect(highWord(1)).toBe(0x3ff00000);
    expect(highWord(-2)).toBe(0xc0000000);
    expect(highWord(0.1)).toBe(0x3fb99999);
    const values = Float64Array.of(0.37, 1e-300, 2.5);
    const words = new Uint32Array(values.buffer);
    for (let i = 0; i < values.length; i++) expect(words[2 * i + HIGH_WORD]).toBe(highWord(values[i]));
  });

  it('has ln 2 split so that e·ln 2_hi is exact for every exponent, and tables of the generated sizes', () => {
    // a multiple of 2^-42 below 1 has at most 42 significant bits; times |e| ≤ 1074 (11 bits) it stays exact
    const ln2Hi = tables.LOG_HI[tables.STEPS];
    expect(Number.isInteger(ln2Hi * 2 ** 42)).toBe(true);
    expect(ln2Hi + tables.LOG_LO[tables.STEPS]).toBe(Math.LN2);
    expect(tables.EXP_HI.length).toBe(tables.STEPS);
    expect(tables.LOG_HI.length).toBe(tables.STEPS + 1);
    expect(tables.HALF_HI[tables.STEPS]).toBe(0);
    // e^(k·step) for k up to 2^19 (|t| < 745): the high part of the step has at most 34 significant bits
    expect(Number.isInteger(tables.EXP_LN2_STEP_HI * tables.STEPS * 2 ** 34)).toBe(true);
  });
});
