// Runs every benchmark in turn: `npx tsx bench/index.ts` (or `npm run bench`).
import { runCoreBench } from './core';
import { runPowerBench } from './power';

await runCoreBench();
await runPowerBench();
