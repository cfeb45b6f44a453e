// Runs every benchmark in turn: `npx tsx bench/index.ts` (or `npm run bench`).
import { runCoreBench } from './core';
import { runPowerBench } from './power';
import { runPlannerBench } from './planner';
import { runAnalysisBench } from './analysis';
import { runAdaptiveBench } from './adaptive';
import { runScaleBench } from './scale';

await runCoreBench();
await runPlannerBench();
await runPowerBench();
await runAnalysisBench();
await runAdaptiveBench();
await runScaleBench();
