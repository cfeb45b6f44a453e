#!/usr/bin/env node
// Writes lib/design/exponentialKernel.wasm.ts: the second pass of the exponential batch
// (solveListedExponential in lib/design/optimiseLateDelay.ts) as WebAssembly, two listed elements a
// step, with the table routines of lib/design/elementary.ts written out inline. Every operation is an
// IEEE 754 double operation in the same order as the JavaScript, so each element gets the JavaScript's
// doubles to the last bit (the batch tests compare them). Run from the repository root after changing
// either:   node scripts/generate-exponential-kernel.mjs
import { writeFileSync } from 'node:fs';
import path from 'node:path';
import wabtInit from 'wabt';

/** Memory layout of the module, in bytes, for rounds of ROUND elements. */
export const LAYOUT = (() => {
  const ROUND = 2048;
  const table = 4096; // 512 doubles a table slot (the tables have 256 or 257 entries)
  const array = 8 * (ROUND + 8); // a round's doubles, with room for the padding element
  let at = 8 * table;
  const next = (bytes) => ((at += bytes), at - bytes);
  const layout = {
    ROUND,
    EXP_HI: 0, EXP_LO: table, LOG_HI: 2 * table, LOG_LO: 3 * table, HALF_HI: 4 * table, HALF_LO: 5 * table, INVERSE_POINT: 6 * table, POINT_FROM_TWO: 7 * table,
    X: next(array), D: next(array), K: next(array), K_LARGE: next(array),
    LOWER: next(array), UPPER: next(array), LATE: next(array), GAP: next(array),
    INDEX: next(4 * (ROUND + 8)),
  };
  return { ...layout, BYTES: at, PAGES: Math.ceil(at / 65536) };
})();

const L = LAYOUT;
const f64 = (v) => `(f64x2.splat (f64.const ${v}))`;
/** Two table entries (byte offsets in locals j0, j1) as one vector. */
const gather = (table, j0, j1) => `(f64x2.replace_lane 1 (f64x2.splat (f64.load offset=${table} (local.get ${j0}))) (f64.load offset=${table} (local.get ${j1})))`;

/** elementary.ts expOf (c = 0) or expm1Of (c = 1) for t in [−708, 709], both lanes, into `out`. */
function expMinus(p, t, c, out) {
  return `
    (local.set $${p}k (f64x2.sub (f64x2.add (f64x2.mul ${t} (global.get $expStepsPerLn2)) ${f64(6755399441055744)}) ${f64(6755399441055744)}))
    (local.set $${p}r (f64x2.sub (f64x2.sub ${t} (f64x2.mul (local.get $${p}k) (global.get $expStepHi))) (f64x2.mul (local.get $${p}k) (global.get $expStepLo))))
    (local.set $${p}kk (i32x4.trunc_sat_f64x2_s_zero (local.get $${p}k)))
    (local.set $${p}scale (i64x2.shl (i64x2.extend_low_i32x4_s (i32x4.add (i32x4.shr_s (local.get $${p}kk) (i32.const 8)) (i32x4.splat (i32.const 1023)))) (i32.const 52)))
    (local.set $${p}j0 (i32.shl (i32.and (i32x4.extract_lane 0 (local.get $${p}kk)) (i32.const 255)) (i32.const 3)))
    (local.set $${p}j1 (i32.shl (i32.and (i32x4.extract_lane 1 (local.get $${p}kk)) (i32.const 255)) (i32.const 3)))
    (local.set $${p}s (f64x2.mul ${gather(L.EXP_HI, `$${p}j0`, `$${p}j1`)} (local.get $${p}scale)))
    (local.set $${p}r2 (f64x2.mul (local.get $${p}r) (local.get $${p}r)))
    (local.set ${out} (f64x2.add (f64x2.sub (local.get $${p}s) ${f64(c)})
      (f64x2.add (f64x2.mul ${gather(L.EXP_LO, `$${p}j0`, `$${p}j1`)} (local.get $${p}scale))
        (f64x2.mul (local.get $${p}s) (f64x2.add
          (f64x2.add (local.get $${p}r) (f64x2.mul (local.get $${p}r2) (f64x2.add ${f64(0.5)} (f64x2.mul (local.get $${p}r) ${f64(1 / 6)}))))
          (f64x2.mul (f64x2.mul (local.get $${p}r2) (local.get $${p}r2)) (f64x2.add ${f64(1 / 24)} (f64x2.mul (local.get $${p}r) ${f64(1 / 120)}))))))))`;
}
const expLocals = (p) => [`$${p}k v128`, `$${p}r v128`, `$${p}kk v128`, `$${p}scale v128`, `$${p}j0 i32`, `$${p}j1 i32`, `$${p}s v128`, `$${p}r2 v128`];

/** elementary.ts log1pRest of the vector in local r (r2 its square): an expression. */
const log1pRest = (r, r2) => `(f64x2.add
      (f64x2.add (f64x2.sub (local.get ${r}) (f64x2.mul (local.get ${r2}) ${f64(0.5)}))
        (f64x2.mul (f64x2.mul (local.get ${r2}) (local.get ${r})) (f64x2.sub ${f64(1 / 3)} (f64x2.mul (local.get ${r}) ${f64(0.25)}))))
      (f64x2.mul (f64x2.mul (f64x2.mul (local.get ${r2}) (local.get ${r2})) (local.get ${r})) (f64x2.sub ${f64(0.2)} (f64x2.mul (local.get ${r}) ${f64(1 / 6)}))))`;

/** elementary.ts lnHalfOnePlus for m in [−1, 0], both lanes, into `out`. */
const lnHalf = (m, out) => `
    (local.set $hjj (i32x4.trunc_sat_f64x2_s_zero (f64x2.add (f64x2.mul (f64x2.add (local.get ${m}) ${f64(1)}) ${f64(256)}) ${f64(0.5)})))
    (local.set $hj0 (i32.shl (i32x4.extract_lane 0 (local.get $hjj)) (i32.const 3)))
    (local.set $hj1 (i32.shl (i32x4.extract_lane 1 (local.get $hjj)) (i32.const 3)))
    (local.set $hr (f64x2.mul (f64x2.add (local.get ${m}) ${gather(L.POINT_FROM_TWO, '$hj0', '$hj1')}) ${gather(L.INVERSE_POINT, '$hj0', '$hj1')}))
    (local.set $hr2 (f64x2.mul (local.get $hr) (local.get $hr)))
    (local.set ${out} (f64x2.add ${gather(L.HALF_HI, '$hj0', '$hj1')} (f64x2.add ${gather(L.HALF_LO, '$hj0', '$hj1')} ${log1pRest('$hr', '$hr2')})))`;

/** elementary.ts logOf for normal positive u, both lanes, into `out` (z by clearing the exponent: the same double as u·2^−e). */
const ln = (u, out) => `
    (local.set $le (i64x2.sub (i64x2.shr_u (local.get ${u}) (i32.const 52)) (v128.const i64x2 1023 1023)))
    (local.set $lef (f64x2.convert_low_i32x4_s (i8x16.shuffle 0 1 2 3 8 9 10 11 0 1 2 3 8 9 10 11 (local.get $le) (local.get $le))))
    (local.set $lz (v128.or (v128.and (local.get ${u}) (v128.const i64x2 0x000fffffffffffff 0x000fffffffffffff)) (v128.const i64x2 0x3ff0000000000000 0x3ff0000000000000)))
    (local.set $ljj (i32x4.trunc_sat_f64x2_s_zero (f64x2.add (f64x2.mul (f64x2.sub (local.get $lz) ${f64(1)}) ${f64(256)}) ${f64(0.5)})))
    (local.set $lj0 (i32.shl (i32x4.extract_lane 0 (local.get $ljj)) (i32.const 3)))
    (local.set $lj1 (i32.shl (i32x4.extract_lane 1 (local.get $ljj)) (i32.const 3)))
    (local.set $lr (f64x2.mul (f64x2.sub (local.get $lz) (f64x2.add ${f64(1)} (f64x2.mul (f64x2.convert_low_i32x4_s (local.get $ljj)) ${f64(1 / 256)}))) ${gather(L.INVERSE_POINT, '$lj0', '$lj1')}))
    (local.set $lr2 (f64x2.mul (local.get $lr) (local.get $lr)))
    (local.set ${out} (f64x2.add
      (f64x2.add (f64x2.mul (local.get $lef) (global.get $ln2Hi)) ${gather(L.LOG_HI, '$lj0', '$lj1')})
      (f64x2.add (f64x2.add (f64x2.mul (local.get $lef) (global.get $ln2Lo)) ${gather(L.LOG_LO, '$lj0', '$lj1')}) ${log1pRest('$lr', '$lr2')})))`;

/** One output vector stored at the two lanes' places in the round. */
const scatter = (array, v) => `
      (f64.store offset=${array} (local.get $i0) (f64x2.extract_lane 0 ${v}))
      (f64.store offset=${array} (local.get $i1) (f64x2.extract_lane 1 ${v}))`;

export const exponentialKernelText = `(module
  (memory (export "memory") ${L.PAGES})
  (global $expStepsPerLn2 (mut v128) (v128.const i64x2 0 0))
  (global $expStepHi (mut v128) (v128.const i64x2 0 0))
  (global $expStepLo (mut v128) (v128.const i64x2 0 0))
  (global $ln2Hi (mut v128) (v128.const i64x2 0 0))
  (global $ln2Lo (mut v128) (v128.const i64x2 0 0))
  (func (export "setConstants") (param $a f64) (param $b f64) (param $c f64) (param $d f64) (param $e f64)
    (global.set $expStepsPerLn2 (f64x2.splat (local.get $a)))
    (global.set $expStepHi (f64x2.splat (local.get $b)))
    (global.set $expStepLo (f64x2.splat (local.get $c)))
    (global.set $ln2Hi (f64x2.splat (local.get $d)))
    (global.set $ln2Lo (f64x2.splat (local.get $e))))
  ;; elements 0…count − 1 of X, D, K, K_LARGE (count even) into LOWER, UPPER, LATE, GAP at INDEX
  (func (export "solve") (param $count i32)
    (local $j i32) (local $a i32) (local $x v128) (local $d v128) (local $k v128) (local $K v128) (local $m v128) (local $half v128) (local $far v128) (local $lnR v128) (local $perK v128) (local $lo v128) (local $i0 i32) (local $i1 i32)
    ${[...expLocals('m'), ...expLocals('f')].map((l) => `(local ${l})`).join(' ')}
    (local $hjj v128) (local $hj0 i32) (local $hj1 i32) (local $hr v128) (local $hr2 v128)
    (local $le v128) (local $lef v128) (local $lz v128) (local $ljj v128) (local $lj0 i32) (local $lj1 i32) (local $lr v128) (local $lr2 v128)
    (block $done (loop $next
      (br_if $done (i32.ge_s (local.get $j) (local.get $count)))
      (local.set $a (i32.shl (local.get $j) (i32.const 3)))
      (local.set $x (v128.load offset=${L.X} (local.get $a)))
      (local.set $d (v128.load offset=${L.D} (local.get $a)))
      (local.set $k (v128.load offset=${L.K} (local.get $a)))
      (local.set $K (v128.load offset=${L.K_LARGE} (local.get $a)))
      ${expMinus('m', '(f64x2.mul (f64x2.sub (local.get $K) (local.get $k)) (local.get $d))', 1, '$m')}
      ${lnHalf('$m', '$half')}
      ${expMinus('f', '(f64x2.mul (f64x2.neg (local.get $K)) (local.get $d))', 0, '$far')}
      ${ln('$x', '$lnR')}
      (local.set $lnR (f64x2.neg (local.get $lnR)))
      (local.set $perK (f64x2.div ${f64(1)} (local.get $K)))
      (local.set $lo (f64x2.add (local.get $d) (f64x2.mul (local.get $lnR) (local.get $perK))))
      (local.set $i0 (i32.shl (i32.load offset=${L.INDEX} (i32.shl (local.get $j) (i32.const 2))) (i32.const 3)))
      (local.set $i1 (i32.shl (i32.load offset=${L.INDEX + 4} (i32.shl (local.get $j) (i32.const 2))) (i32.const 3)))
      ${scatter(L.LOWER, '(local.get $lo)')}
      ${scatter(L.UPPER, '(f64x2.mul (f64x2.add (f64x2.mul (local.get $k) (local.get $d)) (local.get $lnR)) (local.get $perK))')}
      ${scatter(L.LATE, '(f64x2.sub (local.get $lo) (f64x2.mul (local.get $half) (local.get $perK)))')}
      ${scatter(L.GAP, `(f64x2.mul (f64x2.mul (f64x2.mul (f64x2.mul (f64x2.mul ${f64(0.25)} (local.get $x)) (local.get $x)) (local.get $far)) (local.get $m)) (local.get $m))`)}
      (local.set $j (i32.add (local.get $j) (i32.const 2)))
      (br $next)))))
`;

/** The module's bytes, assembled by wabt. */
export async function assembleExponentialKernel() {
  const wabt = await wabtInit();
  const parsed = wabt.parseWat('exponential-kernel.wat', exponentialKernelText, { simd: true });
  parsed.validate();
  return Uint8Array.from(parsed.toBinary({}).buffer);
}

/** The generated TypeScript module for these bytes. */
export function kernelModuleText(bytes) {
  return `// Generated by scripts/generate-exponential-kernel.mjs: do not edit by hand.\n\n/** The exponential batch's second pass as a WebAssembly module, base64. */\nexport const EXPONENTIAL_KERNEL_BASE64 =\n  '${Buffer.from(bytes).toString('base64')}';\n\n/** Byte offsets in its memory. */\nexport const EXPONENTIAL_KERNEL_LAYOUT = ${JSON.stringify(LAYOUT)} as const;\n`;
}

if (process.argv[1] && path.resolve(process.argv[1]) === path.resolve(import.meta.filename)) {
  const out = path.join(import.meta.dirname, '..', 'lib', 'design', 'exponentialKernel.wasm.ts');
  const bytes = await assembleExponentialKernel();
  writeFileSync(out, kernelModuleText(bytes));
  console.log(`wrote ${out}: ${bytes.length} bytes`);
}
