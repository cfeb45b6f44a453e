import * as tables from './elementaryTables';

/*
 * e^t, e^t − 1, ln u and ln(1 + m/2) by table and short polynomial, for the closed-form solvers that
 * run millions of times (the exponential optimum). Each Math.exp, Math.log, Math.expm1 or Math.log1p
 * is a call into the engine's library (7–10 ns a call on the development machine, measured one at a
 * time); these are plain arithmetic the compiler keeps inline in the calling loop, at the same
 * accuracy (within one unit in the last place, swept against 50-digit values in
 * tests/unit/design/elementary.fixtures.test.ts).
 *
 * Each splits its argument into a table point and a small rest, looks the table point's value up as
 * a double-double pair (scripts/generate-elementary-tables.py, mpmath at 50 digits), and takes the
 * rest from its Taylor polynomial, which at |r| ≤ 1/512 is exact to far below a unit in the last place.
 * Arguments outside the range the reduction covers exactly (results that are subnormal or overflow,
 * subnormal or non-finite inputs) go to Math, so every double has a defined, accurate answer.
 * scripts/generate-exponential-kernel.mjs writes the same routines out in WebAssembly for the
 * exponential batch: change both together (the batch tests compare them to the last bit).
 */

// Module-level copies of the generated tables: the compiler folds a module's own constants into the
// code that reads them, while an imported binding is looked up again on every access.
const STEPS = 256;
if (tables.STEPS !== STEPS) throw new Error('elementaryTables.ts was generated for another table size');
const EXP_STEPS_PER_LN2 = tables.EXP_STEPS_PER_LN2;
const EXP_LN2_STEP_HI = tables.EXP_LN2_STEP_HI;
const EXP_LN2_STEP_LO = tables.EXP_LN2_STEP_LO;
const EXP_HI = tables.EXP_HI;
const EXP_LO = tables.EXP_LO;
const LOG_HI = tables.LOG_HI;
const LOG_LO = tables.LOG_LO;
const HALF_HI = tables.HALF_HI;
const HALF_LO = tables.HALF_LO;

/** Powers of two 2^e for e = −1074…1023, index e + 1074: scaling by them is exact. */
const POWERS_OF_TWO = Float64Array.from({ length: 2098 }, (_, i) => 2 ** (i - 1074));
const POW2_OFFSET = 1074;
/** Adding and subtracting 1.5·2^52 rounds a double below 2^51 in magnitude to an integer (to nearest, ties to even). */
const ROUND_SHIFT = 6755399441055744;
/** e^t is a normal double for t in [EXP_MIN, EXP_MAX]; the reduction is exact there. */
const EXP_MIN = -708;
const EXP_MAX = 709;
const STEP = 1 / STEPS;
/** ln 2 as the table's own last entry ln(1 + 256/256), so e·ln 2 + ln c cancels exactly where it should. */
const LN2_HI = LOG_HI[STEPS];
const LN2_LO = LOG_LO[STEPS];
/** 1/(1 + j/256), j = 0…256, the nearest doubles: the reduced argument's relative error stays at one rounding. */
export const INVERSE_POINT = Float64Array.from({ length: STEPS + 1 }, (_, j) => 1 / (1 + j * STEP));
/** 1 − j/256 = 2 − (1 + j/256), exact. */
export const POINT_FROM_TWO = Float64Array.from({ length: STEPS + 1 }, (_, j) => 1 - j * STEP);

const view = new Float64Array(1);
const words = new Uint32Array(view.buffer);
/** Index of the high 32-bit word of a double in a Uint32Array over Float64Array memory (1 on little-endian hosts). */
export const HIGH_WORD = new Uint8Array(Uint16Array.of(1).buffer)[0] === 1 ? 1 : 0;

/**
 * The high 32 bits of a double's binary representation (sign, exponent and top of the significand).
 * Batch loops read the same word from a Uint32Array over their Float64Array instead.
 *
 * @example highWord(1) // 0x3ff00000
 */
export function highWord(u: number): number {
  view[0] = u;
  return words[HIGH_WORD];
}

/**
 * e^t − 1 for any real t, within about a unit in the last place, including tiny |t| (where e^t − 1
 * computed as written would lose every digit). With t = (256n + j)·ln 2/256 + r, |r| ≤ ln 2/512:
 * e^t − 1 = (s − 1) + s·(e^r − 1), s = 2^n·2^(j/256) as a double-double from the table; s − 1 is exact
 * wherever it matters (s within a factor 2 of 1), and n = j = 0 leaves the polynomial in t itself.
 *
 * @example expm1Of(1e-10) // 1.00000000005e-10
 */
export function expm1Of(t: number): number {
  if (!(t >= EXP_MIN && t <= EXP_MAX)) return Math.expm1(t);
  const k = t * EXP_STEPS_PER_LN2 + ROUND_SHIFT - ROUND_SHIFT;
  const r = t - k * EXP_LN2_STEP_HI - k * EXP_LN2_STEP_LO;
  const kk = k | 0;
  const scale = POWERS_OF_TWO[(kk >> 8) + POW2_OFFSET];
  const j = kk & (STEPS - 1);
  const s = EXP_HI[j] * scale;
  return s - 1 + (EXP_LO[j] * scale + s * expm1Rest(r));
}

/**
 * e^t for any real t, within about a unit in the last place (see expm1Of for the reduction).
 * The reduction is written out here again on purpose: shared through a helper, it put the
 * exponential batch's loop over the compiler's inlining budget, and one routine was called instead
 * of inlined (measured 66–70 → 50–63 × 10^6 solves/s).
 *
 * @example expOf(1) // 2.718281828459045
 */
export function expOf(t: number): number {
  if (!(t >= EXP_MIN && t <= EXP_MAX)) return Math.exp(t);
  const k = t * EXP_STEPS_PER_LN2 + ROUND_SHIFT - ROUND_SHIFT;
  const r = t - k * EXP_LN2_STEP_HI - k * EXP_LN2_STEP_LO;
  const kk = k | 0;
  const scale = POWERS_OF_TWO[(kk >> 8) + POW2_OFFSET];
  const j = kk & (STEPS - 1);
  const s = EXP_HI[j] * scale;
  return s + (EXP_LO[j] * scale + s * expm1Rest(r));
}

/** e^r − 1 for |r| ≤ ln 2/512 by its Taylor polynomial to r⁵ (the first term left out, r⁶/720, is below 9e-21). */
const expm1Rest = (r: number): number => {
  const r2 = r * r;
  return r + r2 * (0.5 + r * (1 / 6)) + r2 * r2 * (1 / 24 + r * (1 / 120));
};

/**
 * ln u for u > 0, within about a unit in the last place, given u's high word (highWord(u), or read
 * from a Uint32Array over the caller's array). With u = 2^e·z, z in [1, 2), and the table point
 * c = 1 + j/256 nearest z: ln u = e·ln 2 + ln c + ln(1 + r), r = (z − c)/c, |r| ≤ 1/512; z − c is
 * exact and e·ln 2_hi + (ln c)_hi is exact, so ln u keeps its relative accuracy next to u = 1 from
 * either side. Subnormal, non-finite and non-positive u go to Math.log.
 *
 * @param u the argument
 * @param high highWord(u)
 * @example logOf(0.5, highWord(0.5)) // -0.6931471805599453
 */
export function logOf(u: number, high: number): number {
  const biased = high >>> 20;
  if (biased === 0 || biased >= 0x7ff) return Math.log(u);
  const e = biased - 1023;
  const z = u * POWERS_OF_TWO[POW2_OFFSET - e];
  const j = ((z - 1) * STEPS + 0.5) | 0;
  const r = (z - (1 + j * STEP)) * INVERSE_POINT[j];
  return e * LN2_HI + LOG_HI[j] + (e * LN2_LO + LOG_LO[j] + log1pRest(r));
}

/**
 * ln(1 + m/2) for m in [−1, 0] (the ln((1 + e^y)/2) of the exponential optimum, with m = e^y − 1),
 * within about a unit in the last place. 1 + m/2 = z/2 with z = 2 + m in [1, 2], so no exponent is
 * taken apart: with the table point c = 1 + j/256 nearest z, r = (m + (2 − c))/c, and m + (2 − c) is
 * m itself at c = 2, so the result keeps its relative accuracy as m → 0. Other m go to Math.log1p.
 *
 * @example lnHalfOnePlus(-0.5) // ln 0.75 = -0.2876820724517809
 */
export function lnHalfOnePlus(m: number): number {
  if (!(m >= -1 && m <= 0)) return Math.log1p(0.5 * m);
  const j = ((m + 1) * STEPS + 0.5) | 0;
  const r = (m + POINT_FROM_TWO[j]) * INVERSE_POINT[j];
  return HALF_HI[j] + (HALF_LO[j] + log1pRest(r));
}

/** ln(1 + r) for |r| ≤ 1/512 by its Taylor polynomial to r⁶ (the first term left out, r⁷/7, is below 2e-20). */
const log1pRest = (r: number): number => {
  const r2 = r * r;
  return r - r2 * 0.5 + r2 * r * (1 / 3 - r * 0.25) + r2 * r2 * r * (0.2 - r * (1 / 6));
};
