// Entry of a power worker thread, loaded through tsx (execArgv --import tsx) so the TypeScript
// engine runs unbundled in any server mode. It keeps one prepared simulator per scenario, so
// the calibration caches grow across the chunks of a run.
import { parentPort } from 'node:worker_threads';
import { createPowerSimulator, type PowerSimulator } from '../../../design/power/simulatePower';
import type { PowerScenario } from '../../../design/power/types';

type Request = { id: number; key: string; scenario: PowerScenario; from: number; to: number };

let current: { key: string; simulator: PowerSimulator } | null = null;

parentPort?.on('message', (request: Request) => {
  try {
    if (!current || current.key !== request.key) current = { key: request.key, simulator: createPowerSimulator(request.scenario) };
    const tally = current.simulator.run(request.from, request.to);
    parentPort?.postMessage({ id: request.id, tally, longestCalibrationDelay: current.simulator.longestCalibrationDelay });
  } catch (error) {
    parentPort?.postMessage({ id: request.id, error: error instanceof Error ? `${error.name}: ${error.message}` : String(error) });
  }
});

// tell the pool the listener is in place: messages sent while tsx was still loading this file could be missed
parentPort?.postMessage({ ready: true });
