import { readFileSync } from 'node:fs';
import { afterEach, describe, expect, it } from 'vitest';
import { createRandom, DesignInputError, MODEL_IDS, optimiseLateDelay, optimiseLateDelayBatch, type ModelSpec } from '@/lib/design';
import { setExponentialKernelInUse } from '@/lib/design/optimiseLateDelay';
import { assembleExponentialKernel, kernelModuleText } from '../../../scripts/generate-exponential-kernel.mjs';

const models: ModelSpec[] = MODEL_IDS.flatMap((id): ModelSpec[] => {
  if (id === 'hyperboloid' || id === 'power-delay' || id === 'exponential-power') return [0.3, 1, 2.5].map((sensitivity) => ({ id, sensitivity }));
  if (id === 'quasi-hyperbolic') return [0.4, 0.9, 1].map((presentBias) => ({ id, presentBias }));
  return [{ id }];
});

/** A seeded sweep over the documented ranges: ratios near 0 and 1, d = 0, tiny and huge rates, and about half empty zones. */
function sweep(seed: number, n: number) {
  const random = createRandom({ seed });
  const logUniform = (lo: number, hi: number) => lo * Math.pow(hi / lo, random.uniform());
  const input = { ratio: new Float64Array(n), soonDelay: new Float64Array(n), kSmall: new Float64Array(n), kLarge: new Float64Array(n) };
  for (let i = 0; i < n; i++) {
    const u = random.uniform();
    input.ratio[i] = u < 0.1 ? logUniform(1e-9, 1e-2) : u < 0.2 ? 1 - logUniform(1e-9, 1e-2) : 0.02 + 0.96 * random.uniform();
    input.soonDelay[i] = i % 17 === 0 ? 0 : logUniform(1e-3, 1e4);
    input.kSmall[i] = logUniform(1e-9, 1e3);
    input.kLarge[i] = input.kSmall[i] * logUniform(1e-3, 10);
  }
  return input;
}

describe('optimiseLateDelayBatch', () => {
  it('keeps the TSDoc example: the hyperbolic zone of x = 0.5, d = 10, k = 0.1, K = 0.05 starts at 30 days', () => {
    const one = (v: number) => Float64Array.of(v);
    expect(optimiseLateDelayBatch({ id: 'hyperbolic' }, { ratio: one(0.5), soonDelay: one(10), kSmall: one(0.1), kLarge: one(0.05) }).lower[0]).toBe(30);
  });

  it('gives exactly what optimiseLateDelay gives, element by element, for every model over a seeded sweep (NaN for every empty zone)', () => {
    const input = sweep(18, 4000);
    for (const model of models) {
      const out = optimiseLateDelayBatch(model, input);
      let empty = 0;
      for (let i = 0; i < input.ratio.length; i++) {
        const one = optimiseLateDelay({ model, ratio: input.ratio[i], soonDelay: input.soonDelay[i], kSmall: input.kSmall[i], kLarge: input.kLarge[i] });
        if (one === null) {
          empty++;
          expect([out.lower[i], out.upper[i], out.lateDelay[i], out.gapProduct[i]].every(Number.isNaN), `${model.id} #${i}`).toBe(true);
        } else {
          // toBe is Object.is: the same double, to the last bit
          expect([out.lower[i], out.upper[i], out.lateDelay[i], out.gapProduct[i]], `${model.id} #${i}`).toEqual([one.lower, one.upper, one.lateDelay, one.gapProduct]);
          expect(Object.is(out.lateDelay[i], one.lateDelay) && Object.is(out.gapProduct[i], one.gapProduct)).toBe(true);
        }
      }
      // the sweep covers both outcomes for every model
      expect(empty, model.id).toBeGreaterThan(100);
      expect(empty, model.id).toBeLessThan(input.ratio.length - 100);
    }
  }, 120_000);

  it('gives exactly what optimiseLateDelay gives when ratios repeat in runs, as callers batch one ratio over many rate pairs', () => {
    // the batch keeps ln x while the ratio repeats: runs of one ratio, each run starting at an empty
    // zone or at d = 0 now and then, so a kept logarithm that outlives its ratio shows up here
    const input = sweep(31, 3000);
    const random = createRandom({ seed: 32 });
    let ratio = 0.5;
    for (let i = 0; i < input.ratio.length; i++) {
      if (random.uniform() < 0.05) ratio = random.uniform() < 0.2 ? 1 - 1e-6 * random.uniform() : 0.02 + 0.96 * random.uniform();
      input.ratio[i] = ratio;
    }
    for (const model of models) {
      const out = optimiseLateDelayBatch(model, input);
      let solved = 0;
      for (let i = 0; i < input.ratio.length; i++) {
        const one = optimiseLateDelay({ model, ratio: input.ratio[i], soonDelay: input.soonDelay[i], kSmall: input.kSmall[i], kLarge: input.kLarge[i] });
        const got = [out.lower[i], out.upper[i], out.lateDelay[i], out.gapProduct[i]];
        if (one !== null) solved++;
        // toEqual compares with Object.is: the same double, to the last bit, or NaN in all four for an empty zone
        expect(got, `${model.id} #${i}`).toEqual(one === null ? [NaN, NaN, NaN, NaN] : [one.lower, one.upper, one.lateDelay, one.gapProduct]);
      }
      expect(solved, model.id).toBeGreaterThan(300);
    }
  }, 120_000);

  it('writes into the arrays it is given and returns them, leaving elements past the inputs alone', () => {
    const input = sweep(5, 50);
    const out = { lower: new Float64Array(60).fill(-1), upper: new Float64Array(60), lateDelay: new Float64Array(60), gapProduct: new Float64Array(60) };
    const result = optimiseLateDelayBatch({ id: 'exponential' }, input, out);
    expect(result).toBe(out);
    expect(Array.from(out.lower.subarray(50))).toEqual(Array(10).fill(-1));
    expect(Array.from(out.lateDelay.subarray(0, 50))).toEqual(Array.from(optimiseLateDelayBatch({ id: 'exponential' }, input).lateDelay));
  });

  it('accepts empty arrays', () => {
    const none = new Float64Array(0);
    expect(optimiseLateDelayBatch({ id: 'hyperbolic' }, { ratio: none, soonDelay: none, kSmall: none, kLarge: none }).lower.length).toBe(0);
  });

  it('names the first bad index, and the first bad field at that index', () => {
    const input = sweep(7, 100);
    const bad = (field: 'ratio' | 'soonDelay' | 'kSmall' | 'kLarge', at: number, value: number) => {
      const copy = { ...input, [field]: Float64Array.from(input[field]) };
      copy[field][at] = value;
      copy[field][at + 3] = value;
      try {
        optimiseLateDelayBatch({ id: 'hyperbolic' }, copy);
      } catch (error) {
        expect(error).toBeInstanceOf(DesignInputError);
        return error as DesignInputError;
      }
      throw new Error('no error');
    };
    expect(bad('ratio', 41, 1).field).toBe('ratio[41]');
    expect(bad('ratio', 41, 1).message).toBe('ratio[41] must be a number strictly between 0 and 1 (received 1)');
    expect(bad('ratio', 0, 0).field).toBe('ratio[0]');
    expect(bad('ratio', 90, NaN).message).toBe('ratio[90] must be a number strictly between 0 and 1 (received NaN)');
    expect(bad('soonDelay', 7, -1).message).toBe('soonDelay[7] must be a finite number of days, 0 or more (received -1)');
    expect(bad('soonDelay', 7, Infinity).field).toBe('soonDelay[7]');
    expect(bad('kSmall', 12, 0).message).toBe('kSmall[12] must be a finite number greater than 0 (per day) (received 0)');
    expect(bad('kLarge', 96, Infinity).message).toBe('kLarge[96] must be a finite number greater than 0 (per day) (received Infinity)');
    expect(bad('kLarge', 3, NaN).field).toBe('kLarge[3]');
    // two arrays bad at different places: the earlier index wins; at one index, the fields in the order ratio, soonDelay, kSmall, kLarge
    const both = { ...input, ratio: Float64Array.from(input.ratio), kLarge: Float64Array.from(input.kLarge) };
    both.ratio[60] = 2;
    both.kLarge[20] = -1;
    expect(() => optimiseLateDelayBatch({ id: 'exponential' }, both)).toThrow('kLarge[20] must be');
    both.ratio[20] = 2;
    expect(() => optimiseLateDelayBatch({ id: 'hyperboloid', sensitivity: 0.5 }, both)).toThrow('ratio[20] must be');
  });

  it('refuses in the exponential path exactly what the single solve refuses, and solves the extreme finite inputs it accepts', () => {
    // the exponential loop tests finiteness as one sum; these are the edges of that test
    const edges: [number, number, number, number][] = [
      [0.5, 1e308, 1e308, 1e308],
      [0.5, 1.7976931348623157e308, 1e-300, 1.7976931348623157e308],
      [5e-324, 10, 0.2, 0.1],
      [1 - 2 ** -53, 10, 0.2, 0.1],
      [0.3, 5e-324, 1e300, 1e-300],
      [0.3, 0, 0.2, 0.1],
      [0.3, -0, 0.2, 0.1],
    ];
    const bad: [number, number, number, number, string][] = [
      [0.5, Infinity, 0.1, 0.05, 'soonDelay[0]'],
      [0.5, 10, Infinity, 0.05, 'kSmall[0]'],
      [0.5, 10, 0.1, -Infinity, 'kLarge[0]'],
      [0.5, -1e-300, 0.1, 0.05, 'soonDelay[0]'],
      [0.5, 10, -0, 0.05, 'kSmall[0]'],
      [0.5, NaN, 0.1, 0.05, 'soonDelay[0]'],
      [1, 10, 0.1, 0.05, 'ratio[0]'],
    ];
    const one = (v: number) => Float64Array.of(v);
    for (const [x, d, k, K] of edges) {
      const out = optimiseLateDelayBatch({ id: 'exponential' }, { ratio: one(x), soonDelay: one(d), kSmall: one(k), kLarge: one(K) });
      const single = optimiseLateDelay({ model: { id: 'exponential' }, ratio: x, soonDelay: d, kSmall: k, kLarge: K });
      expect([out.lower[0], out.upper[0], out.lateDelay[0], out.gapProduct[0]], `${x} ${d} ${k} ${K}`).toEqual(single === null ? [NaN, NaN, NaN, NaN] : [single.lower, single.upper, single.lateDelay, single.gapProduct]);
    }
    for (const [x, d, k, K, field] of bad) {
      expect(() => optimiseLateDelay({ model: { id: 'exponential' }, ratio: x, soonDelay: d, kSmall: k, kLarge: K }), field).toThrow(DesignInputError);
      let error: unknown = null;
      try {
        optimiseLateDelayBatch({ id: 'exponential' }, { ratio: one(x), soonDelay: one(d), kSmall: one(k), kLarge: one(K) });
      } catch (caught) {
        error = caught;
      }
      expect(error, field).toBeInstanceOf(DesignInputError);
      expect((error as DesignInputError).field).toBe(field);
    }
  });

  it('has written every output before a bad element when it stops, and none after it, whatever the model', () => {
    const input = sweep(9, 1500);
    input.kSmall[1100] = -1; // past the first thousand elements, so the loops have run over many before it
    for (const model of models) {
      const out = { lower: new Float64Array(1500).fill(-7), upper: new Float64Array(1500), lateDelay: new Float64Array(1500), gapProduct: new Float64Array(1500).fill(-7) };
      expect(() => optimiseLateDelayBatch(model, input, out)).toThrow('kSmall[1100] must be');
      for (let i = 0; i < 1500; i++) {
        if (i >= 1100) {
          expect([out.lower[i], out.gapProduct[i]], `${model.id} #${i}`).toEqual([-7, -7]);
          continue;
        }
        const one = optimiseLateDelay({ model, ratio: input.ratio[i], soonDelay: input.soonDelay[i], kSmall: input.kSmall[i], kLarge: input.kLarge[i] });
        expect([out.lower[i], out.upper[i], out.lateDelay[i], out.gapProduct[i]], `${model.id} #${i}`).toEqual(one === null ? [NaN, NaN, NaN, NaN] : [one.lower, one.upper, one.lateDelay, one.gapProduct]);
      }
    }
  }, 120_000);

  it('refuses a bad model, arrays of another type or length, and output arrays that are too short', () => {
    const input = sweep(9, 10);
    const field = (f: () => unknown) => {
      try {
        f();
      } catch (error) {
        expect(error).toBeInstanceOf(DesignInputError);
        return (error as DesignInputError).field;
      }
      return 'no error';
    };
    expect(field(() => optimiseLateDelayBatch({ id: 'hyperboloid', sensitivity: 0 }, input))).toBe('model.sensitivity');
    expect(field(() => optimiseLateDelayBatch({ id: 'nope' } as unknown as ModelSpec, input))).toBe('model.id');
    expect(field(() => optimiseLateDelayBatch({ id: 'hyperbolic' }, { ...input, kSmall: Array.from(input.kSmall) as unknown as Float64Array }))).toBe('kSmall');
    expect(field(() => optimiseLateDelayBatch({ id: 'hyperbolic' }, { ...input, kLarge: input.kLarge.subarray(1) }))).toBe('kLarge');
    const short = { lower: new Float64Array(10), upper: new Float64Array(9), lateDelay: new Float64Array(10), gapProduct: new Float64Array(10) };
    expect(field(() => optimiseLateDelayBatch({ id: 'hyperbolic' }, input, short))).toBe('out.upper');
    expect(field(() => optimiseLateDelayBatch({ id: 'hyperbolic' }, null as unknown as typeof input))).toBe('input');
  });
});

describe('the exponential batch in WebAssembly and in JavaScript', () => {
  afterEach(() => {
    setExponentialKernelInUse(true);
  });

  it('loads the WebAssembly pass in Node, and both passes give the single solve\'s doubles to the last bit over a seeded sweep', () => {
    // the sweep reaches e^t below −708 and subnormal ratios, which both passes hand to the single solve
    const input = sweep(44, 6000);
    input.ratio[17] = 5e-324;
    input.ratio[18] = 2e-310;
    expect(setExponentialKernelInUse(true)).toBe(true);
    const wasm = optimiseLateDelayBatch({ id: 'exponential' }, input);
    setExponentialKernelInUse(false);
    const js = optimiseLateDelayBatch({ id: 'exponential' }, input);
    let solved = 0;
    for (let i = 0; i < input.ratio.length; i++) {
      const one = optimiseLateDelay({ model: { id: 'exponential' }, ratio: input.ratio[i], soonDelay: input.soonDelay[i], kSmall: input.kSmall[i], kLarge: input.kLarge[i] });
      const want = one === null ? [NaN, NaN, NaN, NaN] : [one.lower, one.upper, one.lateDelay, one.gapProduct];
      if (one !== null) solved++;
      // toEqual compares with Object.is: the same double, to the last bit
      expect([wasm.lower[i], wasm.upper[i], wasm.lateDelay[i], wasm.gapProduct[i]], `WebAssembly #${i}`).toEqual(want);
      expect([js.lower[i], js.upper[i], js.lateDelay[i], js.gapProduct[i]], `JavaScript #${i}`).toEqual(want);
    }
    expect(solved).toBeGreaterThan(1000);
  }, 60_000);

  it('stops at a bad element with every output before it written, in both passes, across round boundaries', () => {
    const input = sweep(45, 5000);
    input.kLarge[4500] = NaN; // in the third round of 2,048
    for (const use of [true, false]) {
      setExponentialKernelInUse(use);
      const out = { lower: new Float64Array(5000).fill(-7), upper: new Float64Array(5000), lateDelay: new Float64Array(5000), gapProduct: new Float64Array(5000) };
      expect(() => optimiseLateDelayBatch({ id: 'exponential' }, input, out)).toThrow('kLarge[4500] must be');
      for (const i of [0, 2047, 2048, 4095, 4096, 4499]) {
        const one = optimiseLateDelay({ model: { id: 'exponential' }, ratio: input.ratio[i], soonDelay: input.soonDelay[i], kSmall: input.kSmall[i], kLarge: input.kLarge[i] });
        expect(out.lower[i], `${use} #${i}`).toBe(one === null ? NaN : one.lower);
      }
      expect(Array.from(out.lower.subarray(4500))).toEqual(Array(500).fill(-7));
    }
  });

  it('runs the module that scripts/generate-exponential-kernel.mjs assembles from its text (regenerate after changing either)', async () => {
    const bytes = await assembleExponentialKernel();
    expect(readFileSync('lib/design/exponentialKernel.wasm.ts', 'utf8')).toBe(kernelModuleText(bytes));
  });
});
