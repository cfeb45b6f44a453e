// Speed of the numerical core: optimal-late-delay solves per second per model over 10^6 seeded
// random inputs, one at a time and in batches beside a vectorised numpy closed form on the same
// inputs, and the time of one expected-reversal-rate evaluation with 2,000 prior draws.
import { spawnSync } from 'node:child_process';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { expectedReversalRate } from '@/lib/criteria';
import {
  calibrationItems,
  createRandom,
  estimateRates,
  optimiseLateDelay,
  optimiseLateDelayBatch,
  priorPoints,
  type Choice,
  type LateDelayBatchOutput,
  type ModelSpec,
  type PairInput,
} from '@/lib/design';

const N = 1_000_000;
const WARM_UP = 2;
const PASSES = 5;
/** Alternating rounds of the batch comparison (batchBench). */
const ROUNDS = 3;

const models: ModelSpec[] = [
  { id: 'hyperbolic' },
  { id: 'exponential' },
  { id: 'quasi-hyperbolic', presentBias: 0.8 },
  { id: 'hyperboloid', sensitivity: 0.7 },
  { id: 'power-delay', sensitivity: 0.7 },
  { id: 'exponential-power', sensitivity: 0.7 },
];

function seededInputs(seed: number) {
  const random = createRandom({ seed });
  const ratio = new Float64Array(N);
  const soonDelay = new Float64Array(N);
  const kSmall = new Float64Array(N);
  const kLarge = new Float64Array(N);
  const logUniform = (lo: number, hi: number) => lo * Math.pow(hi / lo, random.uniform());
  for (let i = 0; i < N; i++) {
    ratio[i] = 0.05 + 0.9 * random.uniform();
    soonDelay[i] = logUniform(1, 365);
    kSmall[i] = logUniform(1e-4, 1);
    kLarge[i] = logUniform(1e-4, 1);
  }
  return { ratio, soonDelay, kSmall, kLarge };
}

type Inputs = ReturnType<typeof seededInputs>;

// One mutable input object is refilled per solve, so the loop measures the solver, not the
// caller's allocation of 10^6 input objects. Every field of the result goes into the checksum:
// once the solver is inlined here, a field never read could be dropped by the compiler.
function pass(model: ModelSpec, inputs: Inputs): { seconds: number; cpuSeconds: number; nonEmpty: number; checksum: number } {
  const input: PairInput = { model, ratio: 0.5, soonDelay: 1, kSmall: 1, kLarge: 1 };
  let checksum = 0;
  let nonEmpty = 0;
  const start = performance.now();
  const cpu = process.cpuUsage();
  for (let i = 0; i < N; i++) {
    input.ratio = inputs.ratio[i];
    input.soonDelay = inputs.soonDelay[i];
    input.kSmall = inputs.kSmall[i];
    input.kLarge = inputs.kLarge[i];
    const o = optimiseLateDelay(input);
    if (o !== null) {
      checksum += o.lower + o.upper + o.lateDelay + o.gapProduct;
      nonEmpty++;
    }
  }
  const used = process.cpuUsage(cpu);
  return { seconds: (performance.now() - start) / 1000, cpuSeconds: (used.user + used.system) / 1e6, nonEmpty, checksum };
}

export async function runCoreBench(): Promise<void> {
  const inputs = seededInputs(20261202);
  console.log(`optimiseLateDelay over ${N.toLocaleString('en')} seeded random inputs (validation included; ${PASSES} passes after ${WARM_UP} warm-up passes)`);
  console.log('  per CPU-second of this process (one core; best and median pass) and per wall-clock second (best pass; lower when other processes share the machine)');
  for (const model of models) {
    for (let r = 0; r < WARM_UP; r++) pass(model, inputs); // let the JIT settle
    const runs = Array.from({ length: PASSES }, () => pass(model, inputs));
    const last = runs[PASSES - 1];
    const cpu = runs.map((r) => r.cpuSeconds).sort((a, b) => a - b);
    const bestWall = Math.min(...runs.map((r) => r.seconds));
    const perSecond = (seconds: number) => (N / seconds / 1e6).toFixed(2).padStart(7);
    const label = `${model.id}${model.sensitivity ? ` s=${model.sensitivity}` : ''}${model.presentBias ? ` β=${model.presentBias}` : ''}`;
    console.log(
      `  ${label.padEnd(26)} ${perSecond(cpu[0])} × 10^6 solves per CPU-s (median ${perSecond(cpu[PASSES >> 1]).trim()})  ${perSecond(bestWall)} × 10^6 per wall-s` +
        `  (non-empty zones ${((100 * last.nonEmpty) / N).toFixed(1)} %, checksum ${last.checksum.toExponential(6)})`,
    );
  }

  batchBench(inputs);

  const prior = { medianSmall: 0.02, medianLarge: 0.005, sdLogSmall: 0.8, sdLogLarge: 0.8, correlation: 0.6 };
  const points = priorPoints(prior, { method: 'monte-carlo', count: 2000, random: createRandom({ seed: 7 }) });
  const setting = { model: { id: 'hyperbolic' } as ModelSpec, ratio: 0.5, soonDelay: 14, choice: { sensitivity: 20, lapse: 0.02 }, points };
  const reps = 5000;
  let sink = 0;
  for (let r = 0; r < 500; r++) sink += expectedReversalRate({ ...setting, lateDelay: 60 + (r % 50) });
  let start = performance.now();
  for (let r = 0; r < reps; r++) sink += expectedReversalRate({ ...setting, lateDelay: 60 + (r % 50) });
  const perEval = (performance.now() - start) / reps;
  start = performance.now();
  for (let r = 0; r < 500; r++) {
    const fresh = priorPoints(prior, { method: 'monte-carlo', count: 2000, random: createRandom({ seed: r }) });
    sink += expectedReversalRate({ ...setting, points: fresh, lateDelay: 90 });
  }
  const withDraws = (performance.now() - start) / 500;
  console.log(`expectedReversalRate, 2,000 prior draws (hyperbolic): ${(perEval * 1000).toFixed(1)} µs per evaluation; ${(withDraws * 1000).toFixed(1)} µs including fresh draws (checksum ${sink.toFixed(6)})`);

  // one participant's calibration block: 20 items per magnitude, fixed γ, as in a power replicate
  const items = calibrationItems({ model: { id: 'hyperbolic' }, countPerMagnitude: 20 });
  const random = createRandom({ seed: 3 });
  const blocks: Choice[][] = Array.from({ length: 2000 }, () => items.map((item) => (random.uniform() < (item.magnitude === 'small' ? 0.5 : 0.6) ? 'LL' : 'SS')));
  for (const b of blocks.slice(0, 200)) sink += estimateRates(b, items, { id: 'hyperbolic' }, { sensitivity: 10 }).small.logRate;
  start = performance.now();
  for (const b of blocks) sink += estimateRates(b, items, { id: 'hyperbolic' }, { sensitivity: 10 }).small.logRate;
  const perPerson = (performance.now() - start) / blocks.length;
  console.log(`estimateRates, 2 × 20 items, fixed γ: ${(perPerson * 1000).toFixed(1)} µs per participant (${(400_000 * perPerson / 1000).toFixed(0)} s for 2,000 replicates × 200 participants on one core)`);
}

/**
 * optimiseLateDelayBatch against the closed forms in numpy (bench/numpy-batch.py) over the same 10^6
 * inputs (handed to Python as raw float64), in ROUNDS alternating rounds: ours, then numpy, each
 * timed as the best of PASSES passes, and each side's best round reported. Times are CPU time of the
 * process (both run on one core: numpy's element-wise operations are single-threaded), which other
 * processes on a shared machine disturb far less than the wall clock; alternating the rounds lets a
 * slow spell of a shared machine fall on both sides alike instead of on whichever ran during it.
 * OpenBLAS tuning variables set for other tools on this machine are removed from Python's
 * environment only, so numpy runs as it does for a methodologist.
 */
export function batchBench(inputs: Inputs = seededInputs(20261202)): void {
  console.log(`optimiseLateDelayBatch vs a vectorised numpy closed form, same ${N.toLocaleString('en')} inputs (${ROUNDS} alternating rounds of ${PASSES} passes each, after a warm-up; each side's best; CPU time of each process: one core each)`);
  const out: LateDelayBatchOutput = { lower: new Float64Array(N), upper: new Float64Array(N), lateDelay: new Float64Array(N), gapProduct: new Float64Array(N) };
  const ours: Record<string, { perSecond: number; checksum: number }> = {};
  let theirs: NumpyRates | string = 'not run';
  for (let round = 0; round < ROUNDS; round++) {
    for (const model of [{ id: 'hyperbolic' }, { id: 'exponential' }] as ModelSpec[]) {
      let best = Infinity;
      for (let r = round === 0 ? 0 : WARM_UP; r < WARM_UP + PASSES; r++) {
        const cpu = process.cpuUsage();
        optimiseLateDelayBatch(model, inputs, out);
        const used = process.cpuUsage(cpu);
        if (r >= WARM_UP) best = Math.min(best, (used.user + used.system) / 1e6);
      }
      let checksum = 0;
      for (let i = 0; i < N; i++) if (out.lower[i] === out.lower[i]) checksum += out.lower[i] + out.upper[i] + out.lateDelay[i] + out.gapProduct[i];
      if (!(ours[model.id]?.perSecond >= N / best)) ours[model.id] = { perSecond: N / best, checksum };
    }
    const numpy = runNumpy(inputs);
    if (typeof numpy === 'string') {
      theirs = numpy;
      break;
    }
    if (typeof theirs === 'string') theirs = numpy;
    else for (const id of ['hyperbolic', 'exponential']) if (numpy[id].perSecond > theirs[id].perSecond) theirs[id] = numpy[id];
  }
  for (const id of ['hyperbolic', 'exponential']) {
    const mine = ours[id];
    const line = `  ${id.padEnd(12)} ours ${(mine.perSecond / 1e6).toFixed(1).padStart(6)} × 10^6 solves/s`;
    if (typeof theirs === 'string') {
      console.log(`${line}  (numpy line skipped: ${theirs})`);
      continue;
    }
    const np = theirs[id];
    const agree = Math.abs(np.checksum / mine.checksum - 1);
    console.log(`${line}  numpy ${theirs.numpy} ${(np.perSecond / 1e6).toFixed(1).padStart(6)} × 10^6/s  → ${(mine.perSecond / np.perSecond).toFixed(2)}× numpy (target ≥ 2×; checksums agree to ${agree.toExponential(1)})`);
  }
}

type NumpyRates = { numpy: string } & Record<string, { perSecond: number; checksum: number }>;

function runNumpy(inputs: Inputs): NumpyRates | string {
  const dir = mkdtempSync(path.join(tmpdir(), 'switchback-bench-'));
  try {
    const file = path.join(dir, 'inputs.f64');
    const all = new Float64Array(4 * N);
    [inputs.ratio, inputs.soonDelay, inputs.kSmall, inputs.kLarge].forEach((a, i) => all.set(a, i * N));
    writeFileSync(file, new Uint8Array(all.buffer));
    const env = { ...process.env };
    delete env.OPENBLAS_CORETYPE;
    delete env.OPENBLAS_L2_SIZE;
    const script = path.join(import.meta.dirname, 'numpy-batch.py');
    const run = spawnSync('python3', [script, file, String(N), String(PASSES)], { env, encoding: 'utf8', timeout: 300_000 });
    if (run.error) return `python3 not found (${run.error.message})`;
    if (run.status !== 0) return `python3 with numpy not available (${(run.stderr || '').trim().split('\n').pop()})`;
    return JSON.parse(run.stdout) as NumpyRates;
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}
