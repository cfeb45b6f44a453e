// Entry of a power worker thread, loaded through tsx (execArgv --import tsx) so the TypeScript
// engine runs unbundled in any server mode. It keeps one prepared simulator per scenario of the
// current run (assumed truth and stress truths), so the calibration caches grow across chunks.
import { parentPort } from 'node:worker_threads';
import { createPowerSimulator, type PowerSimulator } from '../../../design/power/simulatePower';
import type { PowerScenario } from '../../../design/power/types';

type Request = { id: number; key: string; index: number; scenario: PowerScenario; from: number; to: number };

// the run's simulators, one per scenario (the assumed truth and each stress truth)
let current: { key: string; simulators: Map<number, PowerSimulator> } | null = null;

parentPort?.on('message', (request: Request) => {
  try {
    if (!current || current.key !== request.key) current = { key: request.key, simulators: new Map() };
    let simulator = current.simulators.get(request.index);
    if (!simulator) {
      simulator = createPowerSimulator(request.scenario);
      current.simulators.set(request.index, simulator);
    }
    const tally = simulator.run(request.from, request.to);
    parentPort?.postMessage({ id: request.id, tally, longestCalibrationDelay: simulator.longestCalibrationDelay });
  } catch (error) {
    parentPort?.postMessage({ id: request.id, error: error instanceof Error ? `${error.name}: ${error.message}` : String(error) });
  }
});

// tell the pool the listener is in place: messages sent while tsx was still loading this file could be missed
parentPort?.postMessage({ ready: true });
