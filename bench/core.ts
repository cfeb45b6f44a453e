// Speed of the numerical core: optimal-late-delay solves per second per model over 10^6 seeded
// random inputs, and the time of one expected-reversal-rate evaluation with 2,000 prior draws.
import { expectedReversalRate } from '@/lib/criteria';
import { calibrationItems, createRandom, estimateRates, optimiseLateDelay, priorPoints, type Choice, type ModelSpec, type PairInput } from '@/lib/design';

const N = 1_000_000;
const WARM_UP = 2;
const PASSES = 5;

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
