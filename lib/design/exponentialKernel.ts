import { INVERSE_POINT, POINT_FROM_TWO } from './elementary';
import * as tables from './elementaryTables';
import { EXPONENTIAL_KERNEL_BASE64, EXPONENTIAL_KERNEL_LAYOUT as LAYOUT } from './exponentialKernel.wasm';

/**
 * The exponential batch's second pass in WebAssembly (scripts/generate-exponential-kernel.mjs): the
 * listed elements two at a time, with the table routines of elementary.ts written out inline and
 * every double operation in the JavaScript's order, so each element gets the same doubles to the last
 * bit. Its inputs and outputs are arrays in its own memory, which the first pass fills in place.
 */
export type ExponentialKernel = {
  /** a round's listed inputs (room for ROUND + 8 elements) */
  x: Float64Array;
  d: Float64Array;
  k: Float64Array;
  K: Float64Array;
  /** each listed element's place in the round */
  index: Int32Array;
  /** a round's outputs, by place (room for ROUND + 8) */
  lower: Float64Array;
  upper: Float64Array;
  lateDelay: Float64Array;
  gapProduct: Float64Array;
  /** solves listed elements 0…count − 1 (count even; arguments inside the tables' range) */
  solve(count: number): void;
};

/** Elements a round the kernel's arrays hold. */
export const KERNEL_ROUND = LAYOUT.ROUND;

/**
 * The kernel, in Node only, or null. Browsers run this code under a content security policy that
 * does not allow compiling WebAssembly, so there (and wherever compiling fails) the batch keeps to its
 * JavaScript path, which gives the same results.
 */
export function loadExponentialKernel(): ExponentialKernel | null {
  if (typeof process === 'undefined' || typeof process.versions?.node !== 'string' || typeof WebAssembly !== 'object') return null;
  try {
    const bytes = Uint8Array.from(atob(EXPONENTIAL_KERNEL_BASE64), (c) => c.charCodeAt(0));
    const exports = new WebAssembly.Instance(new WebAssembly.Module(bytes), {}).exports as {
      memory: WebAssembly.Memory;
      setConstants(stepsPerLn2: number, stepHi: number, stepLo: number, ln2Hi: number, ln2Lo: number): void;
      solve(count: number): void;
    };
    const { buffer } = exports.memory;
    const doubles = (at: number, length = LAYOUT.ROUND + 8) => new Float64Array(buffer, at, length);
    const tableAt: [number, Float64Array][] = [
      [LAYOUT.EXP_HI, tables.EXP_HI],
      [LAYOUT.EXP_LO, tables.EXP_LO],
      [LAYOUT.LOG_HI, tables.LOG_HI],
      [LAYOUT.LOG_LO, tables.LOG_LO],
      [LAYOUT.HALF_HI, tables.HALF_HI],
      [LAYOUT.HALF_LO, tables.HALF_LO],
      [LAYOUT.INVERSE_POINT, INVERSE_POINT],
      [LAYOUT.POINT_FROM_TWO, POINT_FROM_TWO],
    ];
    for (const [at, table] of tableAt) doubles(at, table.length).set(table);
    exports.setConstants(tables.EXP_STEPS_PER_LN2, tables.EXP_LN2_STEP_HI, tables.EXP_LN2_STEP_LO, tables.LOG_HI[tables.STEPS], tables.LOG_LO[tables.STEPS]);
    return {
      x: doubles(LAYOUT.X),
      d: doubles(LAYOUT.D),
      k: doubles(LAYOUT.K),
      K: doubles(LAYOUT.K_LARGE),
      index: new Int32Array(buffer, LAYOUT.INDEX, LAYOUT.ROUND + 8),
      lower: doubles(LAYOUT.LOWER),
      upper: doubles(LAYOUT.UPPER),
      lateDelay: doubles(LAYOUT.LATE),
      gapProduct: doubles(LAYOUT.GAP),
      solve: exports.solve,
    };
  } catch {
    return null;
  }
}
