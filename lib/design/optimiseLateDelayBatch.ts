import { DesignInputError } from './DesignInputError';
import { solveRange } from './optimiseLateDelay';
import { checkModel } from './validate';
import type { ModelSpec } from './types';

/** Inputs of a batch solve: one element per person or prior point, all of one length. */
export type LateDelayBatchInput = {
  /** magnitude ratio x = S/L, each strictly between 0 and 1 */
  ratio: Float64Array;
  /** soon delay d, days, each finite and 0 or more */
  soonDelay: Float64Array;
  /** discount rate for the small reward, per day, each finite and > 0 */
  kSmall: Float64Array;
  /** discount rate for the large reward, per day, each finite and > 0 */
  kLarge: Float64Array;
};

/** Outputs of a batch solve, element by element; NaN in all four where the zone is empty. */
export type LateDelayBatchOutput = {
  lower: Float64Array;
  upper: Float64Array;
  lateDelay: Float64Array;
  gapProduct: Float64Array;
};

const FIELDS = ['ratio', 'soonDelay', 'kSmall', 'kLarge'] as const;
const OUTPUTS = ['lower', 'upper', 'lateDelay', 'gapProduct'] as const;

/**
 * optimiseLateDelay for many inputs at once: the reversal zone (D_lower, D_upper) and the late
 * delay D* with the largest gap product A·B, for element i of every input array under one model.
 * Each element gets exactly what optimiseLateDelay returns for the same numbers (the same code
 * path to the last bit; see optimiseLateDelay for the formulas and their sources), and NaN in all
 * four outputs where optimiseLateDelay returns null (empty zone, or d = 0).
 *
 * The model and the arrays' types and lengths are checked once; each element is checked as it is
 * read, with the single solve's comparisons, and a bad element stops the batch with an error naming
 * its index and field (outputs before it are already written). No object is made per element. With
 * `out` the results are written into the caller's arrays (reuse them across calls to avoid
 * allocation).
 *
 * @param model the discount model and its shape parameters (as for optimiseLateDelay)
 * @param input four Float64Arrays of equal length
 * @param out optional output arrays, each at least as long as the inputs
 * @returns the output arrays (`out` when given)
 * @throws DesignInputError for a bad model, an input that is not a Float64Array, unequal lengths,
 *   output arrays that are too short, or the first element out of range, e.g. field `kLarge[41]`
 * @example optimiseLateDelayBatch({ id: 'hyperbolic' }, { ratio: Float64Array.of(0.5), soonDelay: Float64Array.of(10), kSmall: Float64Array.of(0.1), kLarge: Float64Array.of(0.05) }).lower[0] // 30
 */
export function optimiseLateDelayBatch(model: ModelSpec, input: LateDelayBatchInput, out?: LateDelayBatchOutput): LateDelayBatchOutput {
  checkModel(model);
  if (input === null || typeof input !== 'object') throw new DesignInputError('input', 'an object of Float64Arrays { ratio, soonDelay, kSmall, kLarge }', input);
  for (const field of FIELDS) {
    if (!(input[field] instanceof Float64Array)) throw new DesignInputError(field, 'a Float64Array', input[field]);
  }
  const { ratio, soonDelay, kSmall, kLarge } = input;
  const n = ratio.length;
  for (const field of FIELDS) {
    if (input[field].length !== n) throw new DesignInputError(field, `a Float64Array of the same length as ratio (${n})`, input[field].length);
  }
  const result = out ?? { lower: new Float64Array(n), upper: new Float64Array(n), lateDelay: new Float64Array(n), gapProduct: new Float64Array(n) };
  if (out !== undefined) {
    if (out === null || typeof out !== 'object') throw new DesignInputError('out', 'an object of Float64Arrays { lower, upper, lateDelay, gapProduct }', out);
    for (const field of OUTPUTS) {
      if (!(out[field] instanceof Float64Array && out[field].length >= n)) throw new DesignInputError(`out.${field}`, `a Float64Array of length ${n} or more`, out[field]?.length);
    }
  }
  solveRange(model.id, model.sensitivity ?? 1, model.presentBias ?? 1, ratio, soonDelay, kSmall, kLarge, result, n, (i) => fail(i, ratio[i], soonDelay[i], kSmall[i], kLarge[i]));
  return result;
}

/** Throws for element i, naming the first of its fields out of range. */
function fail(i: number, x: number, d: number, k: number, K: number): never {
  if (!(x > 0 && x < 1)) throw new DesignInputError(`ratio[${i}]`, 'a number strictly between 0 and 1', x);
  if (!(d >= 0 && d < Infinity)) throw new DesignInputError(`soonDelay[${i}]`, 'a finite number of days, 0 or more', d);
  if (!(k > 0 && k < Infinity)) throw new DesignInputError(`kSmall[${i}]`, 'a finite number greater than 0 (per day)', k);
  throw new DesignInputError(`kLarge[${i}]`, 'a finite number greater than 0 (per day)', K);
}
