// The power task run in a worker thread (bundled into plain JavaScript by worker-bundle.ts). A thread
// keeps one prepared simulator per scenario of the current run (assumed truth and stress truths),
// so the calibration caches grow across the chunks the thread is given.
import { createPowerSimulator, type PowerSimulator } from '../../../design/power/simulatePower';
import type { PowerScenario, PowerTally } from '../../../design/power/types';

/** One chunk of one scenario: replicates [from, to). `key` names the run (the simulator cache's key). */
export type ChunkTask = {
  key: string;
  index: number;
  scenario: PowerScenario;
  from: number;
  to: number;
  /** the run's shared calibration estimates for this scenario's design (threads of one process only) */
  estimates?: SharedArrayBuffer;
};
export type ChunkResult = { tally: PowerTally; longestCalibrationDelay: number | null };

// the current run's simulators, one per scenario (the assumed truth and each stress truth)
let current: { key: string; simulators: Map<number, PowerSimulator> } | null = null;

/** Answers once the thread has loaded this module: a queue worker process starts each thread's load before it takes chunks. */
export function loaded(): true {
  return true;
}

/** Runs replicates [from, to) of the task's scenario and returns their tally. */
export function runChunk(task: ChunkTask): ChunkResult {
  if (!current || current.key !== task.key) current = { key: task.key, simulators: new Map() };
  let simulator = current.simulators.get(task.index);
  if (!simulator) {
    simulator = createPowerSimulator(task.scenario, { sharedEstimates: task.estimates });
    current.simulators.set(task.index, simulator);
  }
  const tally = simulator.run(task.from, task.to);
  return { tally, longestCalibrationDelay: simulator.longestCalibrationDelay };
}
