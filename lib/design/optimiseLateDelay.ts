import * as elementary from './elementary';
import { KERNEL_ROUND, loadExponentialKernel } from './exponentialKernel';
import { numericalOptimum, type NumericalModelId } from './numericalOptimum';
import { checkPairInput } from './validate';
import type { LateDelayOptimum, ModelId, PairInput } from './types';

export type { LateDelayOptimum } from './types';

/**
 * Smallest gap between the soon and the late delay the optimiser returns, days: delays are planned
 * in whole days, and a late delay equal to the soon one is no choice (quasi-hyperbolic optimum at d⁺).
 */
export const LATE_DELAY_STEP = 1;

/**
 * The late delay D* that maximises the gap product C(D) = A(D)·B(D) inside the reversal zone.
 *
 * Hyperbolic (closed form). Write p = 1 + KD, c = Kd, a = x/(1 + kd), so A = 1/p − a and
 * B = x − 1/(p − c). Setting d ln C/dD = 0 gives −1/(p(1 − ap)) + 1/(q(xq − 1)) = 0 with
 * q = p − c, i.e. the quadratic (x + a)p² − 2(1 + xc)p + c(1 + xc) = 0, whose discriminant
 * factorises as (1 + xc)(1 − ac). The quadratic is negative at the lower bound and positive
 * at the upper bound, so the maximum is its larger root:
 *   p* = [(1 + xc) + √((1 + xc)(1 − ac))] / (x + a),   D* = (p* − 1)/K.
 *
 * Exponential and quasi-hyperbolic (closed form). With u = exp(−KD), A = βu − xβe^(−kd) and
 * B = x − βe^(Kd)u are linear in u, so C is a concave quadratic in u with vertex
 * u* = x(1 + βe^((K−k)d)) / (2βe^(Kd)), i.e.
 *   D* = d + [ln(2β/x) − ln(1 + βe^(−(k−K)d))] / K   (β = 1 for the exponential model).
 * For quasi-hyperbolic with β ≤ x the zone starts at D = d and the vertex can fall below it
 * (always so for β ≤ x/(2 − x·e^((K−k)d)), e.g. β ≤ 0.3 at x = 0.6 with K ≈ k): then C falls
 * on the whole zone and its supremum, approached as D → d⁺, is not attained (at D = d the near
 * view's late reward is immediate and escapes β, so the pair is not a choice at all). Delays are
 * planned in whole days, so the late delay is held at least LATE_DELAY_STEP (one day) after the
 * soon one, or at the zone's middle when the zone is shorter than two steps:
 *   D* = max(vertex, d + min(1, (D_upper − d)/2)),
 * the maximum of the concave-in-u C over that feasible part of the zone, with its own C(D*).
 * For the exponential model (β = 1 > x) the vertex always lies inside a non-empty zone, and
 * with m = e^(−(k−K)d) − 1 it reads D* = D_lower − ln(1 + m/2)/K, C* = x²·e^(−Kd)·m²/4.
 *
 * Hyperboloid, power-delay, exponential-power (numerical). What is solved is C′ = 0 in
 * t = ln(D − d), as the root of ψ = d ln C/dt = A′/A + B′/B. B vanishes at D_lower and A at
 * D_upper, so ψ runs from +∞ to −∞ across the zone: the zone itself is a guaranteed bracket.
 * The first point expands C′ = 0 to second order in d about the delay where f_K is halfway
 * between x·f_k(d) and x (the exact optimum as d → 0). Each step is Householder's third-order
 * step (analytic derivatives up to ψ‴) on ψ·(t − t_L)(t_U − t), which has the same root but not
 * ψ's poles at the zone's ends; the bracket is kept by narrowing it to every evaluated point
 * on the side the sign of ψ gives, and by bisecting whenever a step would leave it or fails to
 * halve the step before last (Press et al. 2007, Numerical Recipes §9.4). It stops once a step
 * is at most 1e-5 in t (less near a pole): a fourth-order step that small leaves an error of
 * order 1e-20, so D* is exact to rounding, far inside 1e-10 relative; the gaps are carried to
 * the returned delay by Taylor series. Typically one evaluation, sometimes two. (A
 * function-value maximiser such as Brent's cannot place a smooth maximum better than ~1.5e-8
 * relative, so the tests hold this root against Brent's maximiser, fmin's bisection, the
 * closed forms and a 40-digit bisection in mathjs.) See numericalOptimum.ts.
 *
 * Bounds are the closed forms of reversalZone.
 *
 * Where the gaps themselves underflow a double (f_K(D) below 1e-308, e.g. exponential-power with
 * K·D^s beyond 745) the gap product is 0 across the zone and the numerical models return a point of
 * the zone rather than the optimum of a criterion no double can hold; the closed forms still give D*.
 *
 * @returns null when the zone is empty
 * @throws DesignInputError for any field out of range
 * @example optimiseLateDelay({ model: { id: 'hyperbolic' }, ratio: 0.5, soonDelay: 10, kSmall: 0.1, kLarge: 0.05 })?.lateDelay // (80/3)·(0.5 + √(35/32)) ≈ 41.222
 */
export function optimiseLateDelay(input: PairInput): LateDelayOptimum | null {
  if (!solveOne(input)) return null;
  return { lower: one.lower[0], upper: one.upper[0], lateDelay: one.lateDelay[0], gapProduct: one.gapProduct[0] };
}

/** Zone bounds, optimal late delays and gap products, element by element (the batch solver's outputs). */
export type OptimumArrays = { lower: Float64Array; upper: Float64Array; lateDelay: Float64Array; gapProduct: Float64Array };

/** Scratch of the single solve: it runs the batch kernels on element 0 of these. */
const one: OptimumArrays = { lower: new Float64Array(1), upper: new Float64Array(1), lateDelay: new Float64Array(1), gapProduct: new Float64Array(1) };

/** Validates one input and solves it into `one`; false when the zone is empty. */
function solveOne(input: PairInput): boolean {
  const model = input.model;
  const x = input.ratio;
  const d = input.soonDelay;
  const k = input.kSmall;
  const K = input.kLarge;
  // validation as plain comparisons on the hot path; the full check runs only to report a failure
  if (!(x > 0 && x < 1 && d >= 0 && d < Infinity && k > 0 && k < Infinity && K > 0 && K < Infinity) || model === null || typeof model !== 'object') {
    return invalid(input);
  }
  const s = model.sensitivity;
  const beta = model.presentBias;
  if ((s !== undefined && !(s > 0 && s < Infinity)) || (beta !== undefined && !(beta > 0 && beta <= 1))) return invalid(input);
  const id = model.id;
  if (d === 0) {
    if (id === 'hyperbolic' || id === 'exponential' || id === 'quasi-hyperbolic' || id === 'hyperboloid' || id === 'power-delay' || id === 'exponential-power') return false;
    return invalid(input);
  }
  if (id === 'hyperbolic') return hyperbolicOptimum(x, d, k, K, one, 0);
  if (id === 'exponential') return exponentialOptimum(x, d, k, K, one, 0);
  if (id === 'quasi-hyperbolic') return presentBiasOptimum(x, d, k, K, beta ?? 1, one, 0);
  if (id === 'hyperboloid' || id === 'power-delay' || id === 'exponential-power') return numericalInto(id, s ?? 1, x, d, k, K, one, 0);
  return invalid(input);
}

/**
 * Solves of elements 0…n − 1 (model and arrays already validated) into `o`, NaN in all four
 * outputs for an empty zone or d = 0. One loop per model around the same kernels the single solve
 * runs, so both entry points agree to the last bit and each loop stays monomorphic; the closed
 * forms of the hyperbolic and exponential models run in rounds of passes (nonEmptyOfRound,
 * exponentialRange).
 */
export function solveRange(
  id: ModelId,
  s: number,
  beta: number,
  x: Float64Array,
  d: Float64Array,
  k: Float64Array,
  K: Float64Array,
  o: OptimumArrays,
  n: number,
  fail: (i: number) => never,
): void {
  // each element is checked as it is read (the single solve's comparisons; NaN fails each): a bad
  // element stops the loop with the outputs before it already written
  switch (id) {
    case 'hyperbolic':
      for (let start = 0; start < n; start += ROUND) {
        const count = nonEmptyOfRound(x, d, k, K, o, start, Math.min(n, start + ROUND));
        for (let j = 0; j < count; j++) {
          const i = roundIndices[j];
          hyperbolicOptimum(x[i], d[i], k[i], K[i], o, i);
        }
        if (roundFailure >= 0) fail(roundFailure);
      }
      return;
    case 'exponential':
      exponentialRange(x, d, k, K, o, n, fail);
      return;
    case 'quasi-hyperbolic': {
      // ln β is one number for the whole batch; ln x, which the emptiness test needs for every
      // element, is taken again only when the ratio changes (callers batch one ratio over many
      // rate pairs): the same doubles as the single solve, with fewer library calls
      const lnBeta = Math.log(beta);
      let lastRatio = NaN;
      let lnR = NaN;
      for (let i = 0; i < n; i++) {
        const xi = x[i], di = d[i], ki = k[i], Ki = K[i];
        if (!(xi > 0 && xi < 1 && di >= 0 && di < Infinity && ki > 0 && ki < Infinity && Ki > 0 && Ki < Infinity)) fail(i);
        if (di === 0) {
          empty(o, i);
          continue;
        }
        if (xi !== lastRatio) {
          lastRatio = xi;
          lnR = -logOf(xi, highWord(xi));
        }
        if (!presentBiasInto(lnR, lnBeta, xi, di, ki, Ki, beta, o, i)) empty(o, i);
      }
      return;
    }
    default:
      for (let i = 0; i < n; i++) {
        const xi = x[i], di = d[i], ki = k[i], Ki = K[i];
        if (!(xi > 0 && xi < 1 && di >= 0 && di < Infinity && ki > 0 && ki < Infinity && Ki > 0 && Ki < Infinity)) fail(i);
        if (!(di !== 0 && numericalInto(id, s, xi, di, ki, Ki, o, i))) empty(o, i);
      }
  }
}

/** Elements per round of the hyperbolic loop: a round's inputs are still in the first-level cache when its non-empty elements are solved. */
const ROUND = 512;
/**
 * Elements per round of the exponential loop (2,048, the size of the WebAssembly kernel's arrays),
 * whose passes read and write the round's scratch (16 KB an array): the four block copies out per
 * round are calls, cheapest per element at this size (measured: rounds of 512 were slower, of 4,096
 * no faster).
 */
const EXPONENTIAL_ROUND = KERNEL_ROUND;
/** The indices of a round's non-empty elements (module scratch: solves run one at a time). */
const roundIndices = new Int32Array(ROUND);
/** The first bad element of the last round, or −1. */
let roundFailure = -1;
// The table routines as constants of this module: the compiler folds a module's own constants into
// the loops that use them, while it looks an imported binding up again on every pass of a loop.
const { expm1Of, expOf, HIGH_WORD, highWord, lnHalfOnePlus, logOf } = elementary;
/**
 * The exponential batch's second pass in WebAssembly where it loads (Node), else null; its arrays
 * are the round's scratch below, so the first pass fills them in place for either second pass.
 */
const kernel = loadExponentialKernel();
let kernelInUse = kernel !== null;
/** An exponential round's listed inputs, in list order, each listed element's place, and the ratio's 32-bit words. */
const roundX = kernel?.x ?? new Float64Array(EXPONENTIAL_ROUND + 8);
const roundXWords = new Uint32Array(roundX.buffer, roundX.byteOffset, 2 * roundX.length);
const roundD = kernel?.d ?? new Float64Array(EXPONENTIAL_ROUND + 8);
const roundK = kernel?.k ?? new Float64Array(EXPONENTIAL_ROUND + 8);
const roundKLarge = kernel?.K ?? new Float64Array(EXPONENTIAL_ROUND + 8);
const roundPlaces = kernel?.index ?? new Int32Array(EXPONENTIAL_ROUND + 8);
/** An exponential round's outputs, by place in the round (NaN where the zone is empty). */
const roundLower = kernel?.lower ?? new Float64Array(EXPONENTIAL_ROUND + 8);
const roundUpper = kernel?.upper ?? new Float64Array(EXPONENTIAL_ROUND + 8);
const roundLate = kernel?.lateDelay ?? new Float64Array(EXPONENTIAL_ROUND + 8);
const roundGap = kernel?.gapProduct ?? new Float64Array(EXPONENTIAL_ROUND + 8);
const roundOutputs: OptimumArrays = { lower: roundLower, upper: roundUpper, lateDelay: roundLate, gapProduct: roundGap };
/** The non-empty elements of a round whose arguments lie outside the tables' range (solved one by one), and how many. */
const roundSlow = new Int32Array(EXPONENTIAL_ROUND);
let roundSlowCount = 0;

/**
 * Whether exponential batches run their second pass in WebAssembly where it loads (the default) or
 * in JavaScript. Both give the same doubles; the tests switch it to check the JavaScript path in Node.
 *
 * @returns whether the WebAssembly pass is loaded in this process
 */
export function setExponentialKernelInUse(use: boolean): boolean {
  kernelInUse = use && kernel !== null;
  return kernel !== null;
}

/**
 * The first pass of a round of the hyperbolic loop: checks elements start…end − 1,
 * writes NaN in their outputs, and lists in roundIndices those whose zone is not empty, without a
 * branch on emptiness (about half of all random rate pairs give an empty zone, so a branch on it
 * would be mispredicted about every other element). Stops at a bad element (roundFailure), so the
 * elements before it are solved before the error is thrown. Returns how many were listed.
 */
function nonEmptyOfRound(x: Float64Array, d: Float64Array, k: Float64Array, K: Float64Array, o: OptimumArrays, start: number, end: number): number {
  const { lower, upper, lateDelay, gapProduct } = o;
  roundFailure = -1;
  let count = 0;
  for (let i = start; i < end; i++) {
    const xi = x[i], di = d[i], ki = k[i], Ki = K[i];
    if (!(xi > 0 && xi < 1 && di >= 0 && di < Infinity && ki > 0 && ki < Infinity && Ki > 0 && Ki < Infinity)) {
      roundFailure = i;
      break;
    }
    lower[i] = NaN;
    upper[i] = NaN;
    lateDelay[i] = NaN;
    gapProduct[i] = NaN;
    roundIndices[count] = i;
    // the emptiness test of hyperbolicOptimum
    count += +(di !== 0 && (ki * di) / xi > Ki * di);
  }
  return count;
}

function empty(o: OptimumArrays, i: number): void {
  o.lower[i] = NaN;
  o.upper[i] = NaN;
  o.lateDelay[i] = NaN;
  o.gapProduct[i] = NaN;
}

function store(o: OptimumArrays, i: number, lower: number, upper: number, lateDelay: number, gapProduct: number): true {
  o.lower[i] = lower;
  o.upper[i] = upper;
  o.lateDelay[i] = lateDelay;
  o.gapProduct[i] = gapProduct;
  return true;
}

const numerical: LateDelayOptimum = { lower: 0, upper: 0, lateDelay: 0, gapProduct: 0 };

function numericalInto(id: ModelId, s: number, x: number, d: number, k: number, K: number, o: OptimumArrays, i: number): boolean {
  if (!numericalOptimum(id as NumericalModelId, s, x, d, k, K, numerical)) return false;
  return store(o, i, numerical.lower, numerical.upper, numerical.lateDelay, numerical.gapProduct);
}

function invalid(input: PairInput): never {
  checkPairInput(input.model, input.ratio, input.soonDelay, input.kSmall, input.kLarge);
  throw new Error('optimiseLateDelay: input rejected'); // unreachable: checkPairInput throws first
}

function hyperbolicOptimum(x: number, d: number, k: number, K: number, o: OptimumArrays, i: number): boolean {
  // non-empty iff k > xK; tested as k·d/x > K·d, the same expression reversalZone uses
  if (!((k * d) / x > K * d)) return false;
  const xK = x * K;
  const lower = d + (1 - x) / xK;
  const upper = (1 - x + k * d) / xK;
  const c = K * d;
  const a = x / (1 + k * d);
  const xc1 = 1 + x * c;
  const p = (xc1 + Math.sqrt(xc1 * (1 - a * c))) / (x + a);
  const gapProduct = (1 / p - a) * (x - 1 / (p - c));
  return store(o, i, lower, upper, (p - 1) / K, gapProduct);
}

/**
 * The β = 1 case of presentBiasOptimum, with emptiness (k·d > K·d) tested before anything else (about
 * half of all random rate pairs give an empty zone) and e^t, e^t − 1 and the logarithms taken by the
 * table routines of elementary.ts: Math.log, expm1, log1p and exp are each a library call costing
 * more than the arithmetic of a whole hyperbolic solve. With m = e^y − 1, y = (K − k)d < 0 (no
 * cancellation near the emptiness boundary), D* − D_lower = −ln(1 + m/2)/K. The batch runs the same
 * steps (solveListedExponential), so both agree to the last bit.
 */
function exponentialOptimum(x: number, d: number, k: number, K: number, o: OptimumArrays, i: number): boolean {
  const kd = k * d;
  if (!(kd > K * d)) return false;
  const m = expm1Of((K - k) * d);
  const lnHalf = lnHalfOnePlus(m);
  const far = expOf(-K * d);
  const lnR = -logOf(x, highWord(x));
  const perK = 1 / K;
  const lower = d + lnR * perK;
  return store(o, i, lower, (kd + lnR) * perK, lower - lnHalf * perK, 0.25 * x * x * far * m * m);
}

/**
 * The exponential case of solveRange, in rounds of EXPONENTIAL_ROUND elements and two passes: the
 * checks, the emptiness test and a copy of each non-empty element's inputs to the round's scratch
 * (listExponentialRound), then exponentialOptimum's steps for the listed elements, two at a time in
 * WebAssembly where it loads (exponentialKernel.ts, Node) or one at a time in JavaScript
 * (solveListedExponential). The second pass reads and writes only the round's scratch, which
 * compiled code reaches far more cheaply than the caller's arrays, and keeps the table routines
 * inline. The few non-empty elements whose arguments lie outside the tables' range are solved one
 * by one (exponentialOptimum, with the Math fallbacks). The round's outputs are then copied out in
 * four block copies (up to a bad element, which is thrown for after them).
 */
function exponentialRange(x: Float64Array, d: Float64Array, k: Float64Array, K: Float64Array, o: OptimumArrays, n: number, fail: (i: number) => never): void {
  for (let start = 0; start < n; start += EXPONENTIAL_ROUND) {
    const end = Math.min(n, start + EXPONENTIAL_ROUND);
    const count = listExponentialRound(x, d, k, K, start, end);
    if (kernel !== null && kernelInUse) {
      if (count & 1) {
        // an odd count is padded with a copy of the last listed element, written to a spare place
        roundX[count] = roundX[count - 1];
        roundD[count] = roundD[count - 1];
        roundK[count] = roundK[count - 1];
        roundKLarge[count] = roundKLarge[count - 1];
        roundPlaces[count] = EXPONENTIAL_ROUND + 1;
      }
      kernel.solve(count + (count & 1));
    } else {
      solveListedExponential(count);
    }
    for (let s = 0; s < roundSlowCount; s++) {
      const i = roundSlow[s];
      exponentialOptimum(x[start + i], d[start + i], k[start + i], K[start + i], roundOutputs, i);
    }
    const done = (roundFailure >= 0 ? roundFailure : end) - start;
    o.lower.set(roundLower.subarray(0, done), start);
    o.upper.set(roundUpper.subarray(0, done), start);
    o.lateDelay.set(roundLate.subarray(0, done), start);
    o.gapProduct.set(roundGap.subarray(0, done), start);
    if (roundFailure >= 0) fail(roundFailure);
  }
}

/**
 * The first pass of an exponential round: checks elements start…end − 1 (stopping at a bad one,
 * roundFailure), writes NaN in their places of the round's outputs, and lists those whose zone is
 * not empty without a branch on emptiness (see nonEmptyOfRound), with copies of their inputs in
 * list order. Returns how many were listed.
 */
function listExponentialRound(x: Float64Array, d: Float64Array, k: Float64Array, K: Float64Array, start: number, end: number): number {
  roundFailure = -1;
  let count = 0;
  let slow = 0;
  for (let i = start; i < end; i++) {
    const xi = x[i], di = d[i], ki = k[i], Ki = K[i];
    // the single solve's test with fewer branches: d, k, K are finite iff a quarter of their sum is
    // (three quarters of the largest double is finite), and NaN fails every comparison
    if (!(xi > 0 && xi < 1 && di >= 0 && ki > 0 && Ki > 0 && 0.25 * di + 0.25 * ki + 0.25 * Ki < Infinity)) {
      roundFailure = i;
      break;
    }
    roundLower[i - start] = NaN;
    roundUpper[i - start] = NaN;
    roundLate[i - start] = NaN;
    roundGap[i - start] = NaN;
    roundPlaces[count] = i - start;
    roundX[count] = xi;
    roundD[count] = di;
    roundK[count] = ki;
    roundKLarge[count] = Ki;
    roundSlow[slow] = i - start;
    // the emptiness test of exponentialOptimum (d = 0 fails it too: 0 > 0 is false), and whether the
    // tables take every argument (e^t for t ≥ −708, ln x for a normal x) or the Math fallbacks are needed
    const nonEmpty = +(ki * di > Ki * di);
    const tabled = +((Ki - ki) * di >= -708 && -Ki * di >= -708 && xi >= 2.2250738585072014e-308);
    count += nonEmpty & tabled;
    slow += nonEmpty & (1 - tabled);
  }
  roundSlowCount = slow;
  return count;
}

/**
 * The second pass of an exponential round: exponentialOptimum's steps for each listed element, from
 * and into the round's scratch. ln x is taken again only when the ratio changes (callers batch one
 * ratio over many rate pairs): the same doubles, with one logarithm per run of a ratio. The four
 * table routines come to about 890 bytes of bytecode, just under what the compiler inlines into one
 * function (920 in Node 20's engine); past that a routine is called instead, at a fifth of the speed.
 */
function solveListedExponential(count: number): void {
  let lastRatio = NaN;
  let lnR = NaN;
  for (let j = 0; j < count; j++) {
    const i = roundPlaces[j];
    const x = roundX[j], d = roundD[j], k = roundK[j], K = roundKLarge[j];
    const m = expm1Of((K - k) * d);
    const lnHalf = lnHalfOnePlus(m);
    const far = expOf(-K * d);
    if (x !== lastRatio) {
      lastRatio = x;
      lnR = -logOf(x, roundXWords[2 * j + HIGH_WORD]);
    }
    const perK = 1 / K;
    const lo = d + lnR * perK;
    roundLower[i] = lo;
    roundUpper[i] = (k * d + lnR) * perK;
    roundLate[i] = lo - lnHalf * perK;
    roundGap[i] = 0.25 * x * x * far * m * m;
  }
}

function presentBiasOptimum(x: number, d: number, k: number, K: number, beta: number, o: OptimumArrays, i: number): boolean {
  return presentBiasInto(-logOf(x, highWord(x)), Math.log(beta), x, d, k, K, beta, o, i);
}

/** presentBiasOptimum given lnR = −ln x and ln β, which the batch takes once per ratio and once per batch. */
function presentBiasInto(lnR: number, lnBeta: number, x: number, d: number, k: number, K: number, beta: number, o: OptimumArrays, i: number): boolean {
  const a = Math.max(0, lnBeta + lnR);
  // zone width is (k·d + ln r − a − K·d)/K; its sign is tested on the rates (as in reversalZone), not on rounded bounds
  const span = a > 0 ? k * d - lnBeta : k * d + lnR;
  if (!(span > K * d)) return false;
  const perK = 1 / K;
  const lower = d + a * perK;
  const upper = (k * d + lnR) * perK;
  // y = ln β + (K − k)d; the vertex is D* = d + [ln 2 + ln β + ln r − ln(1 + e^y)]/K
  const y = lnBeta + (K - k) * d;
  if (a > 0) {
    // β > x, so non-emptiness forces y < 0. D* − D_lower = −ln(1 + expm1(y)/2)/K has no
    // cancellation, and at the vertex A = x·e^(−Kd)·(1 − e^y)/2 and B = x·(1 − e^y)/2. The same
    // steps as exponentialOptimum, so β = 1 gives the exponential optimum to the last bit.
    const m = expm1Of(y);
    const lateDelay = lower - lnHalfOnePlus(m) * perK;
    return store(o, i, lower, upper, lateDelay, 0.25 * x * x * expOf(-K * d) * m * m);
  }
  const log1pEy = y > 0 ? y + Math.log1p(Math.exp(-y)) : Math.log1p(Math.exp(y));
  // the zone starts at d; C's supremum at d⁺ is not a pair, so the late delay keeps a step after d
  const first = d + Math.min(LATE_DELAY_STEP, 0.5 * (upper - d));
  const lateDelay = Math.max(d + (Math.LN2 + lnBeta + lnR - log1pEy) / K, first);
  const nearFactor = beta * Math.exp(-K * (lateDelay - d)); // f_K(D − d), D − d > 0
  const far = beta * (Math.exp(-K * lateDelay) - x * Math.exp(-k * d));
  return store(o, i, lower, upper, lateDelay, far * (x - nearFactor));
}
