// Adaptive calibration (docs/mathematics.md, "Adaptive calibration"): the time of one adaptive step —
// recording an answer and choosing the next item among ≥ 500 candidates on a 40 × 40 × 10 grid — and the
// seeded simulation that closes issue 17: items adaptive calibration needs to reach the fixed block's
// standard error of ln k, and the share of stage-2 probes inside the true zone at equal item counts.
import os from 'node:os';
import { AdaptiveCalibration, calibrationCandidates, compareCalibration, createRandom, rateGrid, type PowerDesign } from '@/lib/design';
import { frozenDesign, powerDesign } from '@/tests/support/frozen-design';

const STEPS = 12;
const PARTICIPANTS = 60;

export async function runAdaptiveBench(): Promise<void> {
  const prior = { medianSmall: 0.02, medianLarge: 0.008, sdLogSmall: 1, sdLogLarge: 1, correlation: 0.8 };
  const buildStart = performance.now();
  const grid = rateGrid({ model: { id: 'hyperboloid', sensitivity: 0.8 }, prior, rateNodes: 40, sensitivity: { nodes: 10 } });
  const candidates = calibrationCandidates({ smallAmount: 82, largeAmount: 100, minDelay: 1, maxDelay: 730, amountUnit: 0.5 });
  const engine = new AdaptiveCalibration({ grid, candidates, choice: { sensitivity: 10 } });
  const buildMs = performance.now() - buildStart;
  const cells = grid.logSmall.length * grid.logLarge.length * grid.logSensitivity.length;
  const random = createRandom({ seed: 17 });
  const times: number[] = [];
  const cpuStart = process.cpuUsage();
  let checksum = 0;
  for (let p = 0; p < PARTICIPANTS; p++) {
    engine.reset();
    let next = engine.choose({ seed: p });
    for (let n = 0; n < STEPS && next; n++) {
      const start = performance.now();
      engine.answer({ index: next.index, choice: random.uniform() < 0.5 ? 'SS' : 'LL' });
      next = engine.choose({ seed: p });
      times.push(performance.now() - start);
      checksum += next?.information ?? 0;
    }
  }
  const cpu = process.cpuUsage(cpuStart);
  times.sort((a, b) => a - b);
  const at = (q: number) => times[Math.min(times.length - 1, Math.floor(q * times.length))];
  console.log(`adaptive calibration: one step = record an answer + choose among ${candidates.length} candidates on a ${grid.logSmall.length} × ${grid.logLarge.length} × ${grid.logSensitivity.length} grid (${cells} cells, hyperboloid)`);
  console.log(
    `  ${times.length} steps: median ${at(0.5).toFixed(2)} ms, p95 ${at(0.95).toFixed(2)} ms, max ${times[times.length - 1].toFixed(2)} ms wall (target ≤ 20 ms); ` +
      `${((cpu.user + cpu.system) / 1000 / times.length).toFixed(2)} ms CPU per step incl. bookkeeping; engine built once per design in ${buildMs.toFixed(1)} ms (checksum ${checksum.toFixed(6)})`,
  );
  console.log(`  machine load average: ${os.loadavg().map((l) => l.toFixed(1)).join(' / ')} (1 / 5 / 15 min) on ${os.cpus().length} cores`);

  const designs: [string, PowerDesign][] = [
    ['unit design (hyperbolic, x = 0.6, 10 items per magnitude, prior SD 0.8, ρ = 0.5)', { ...frozenDesign(), soonDelay: 14 }],
    ['power design (hyperbolic, x = 0.82, 20 items per magnitude, prior SD 1, ρ = 0.8)', { ...powerDesign(), soonDelay: 30 }],
  ];
  for (const [name, design] of designs) {
    const start = performance.now();
    const r = compareCalibration(design, { participants: 1000, seed: 20261203, fixedCounts: [8, 12, 16, 20] });
    const reference = r.reference;
    console.log(`adaptive vs fixed calibration, ${name}: ${r.participants} simulated participants, seed 20261203 (${((performance.now() - start) / 1000).toFixed(1)} s)`);
    console.log(
      `  fixed block of ${reference.items} items: RMSE of ln k ${reference.rmseLogSmall.toFixed(3)}, ln K ${reference.rmseLogLarge.toFixed(3)}; ` +
        `adaptive reaches it with ${r.itemsToMatch ?? 'more than ' + r.adaptive.length} items (${r.itemsToMatch ? ((100 * r.itemsToMatch) / reference.items).toFixed(0) : '—'} % of the block; target ≤ 60 %)`,
    );
    for (const fixed of r.fixed) {
      const a = r.adaptive[fixed.items - 1];
      console.log(
        `  ${String(fixed.items).padStart(2)} items: RMSE ln k fixed ${fixed.rmseLogSmall.toFixed(3)} / adaptive ${a.rmseLogSmall.toFixed(3)}; ` +
          `probes inside the true zone fixed ${(100 * fixed.probesInTrueZone).toFixed(1)} % / adaptive ${(100 * a.probesInTrueZone).toFixed(1)} %`,
      );
    }
  }
}
