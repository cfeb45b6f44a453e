// Planner benchmark: one field change on the design page (recompute + redraw both charts) and
// on the prior page (recompute + redraw the 2,000-point scatter) timed in headless Chromium.
// Self-contained: the browser code is bundled here with esbuild and loaded into a blank page, so
// no server is needed. Skips with a message when Chromium or the bundler is missing.
import { existsSync } from 'node:fs';
import path from 'node:path';

const CHROMIUM = process.env.CHROMIUM_PATH || '/usr/bin/chromium';
const BUDGET_MS = 16;
const RUNS = 60;

type Timing = { label: string; draws: number; runs: number; medianMs: number; p95Ms: number; maxMs: number };

/** Runs the planner benchmark and prints one line per scenario; never throws (skips instead). */
export async function runPlannerBench(): Promise<void> {
  console.log('\nPlanner: recompute and redraw after one field change, in Chromium');
  if (!existsSync(CHROMIUM)) {
    console.log(`  skipped: no Chromium at ${CHROMIUM} (set CHROMIUM_PATH)`);
    return;
  }
  let bundle: string;
  try {
    const esbuild = await import('esbuild');
    const root = path.resolve(import.meta.dirname, '..');
    const result = await esbuild.build({
      entryPoints: [path.join(root, 'bench', 'planner-page.ts')],
      bundle: true,
      write: false,
      format: 'iife',
      platform: 'browser',
      target: 'es2022',
      minify: true,
      alias: { '@': root },
      logLevel: 'silent',
    });
    bundle = result.outputFiles[0].text;
  } catch (error) {
    console.log(`  skipped: could not bundle the page code (${(error as Error).message.split('\n')[0]})`);
    return;
  }
  const { chromium } = await import('playwright-core');
  let browser;
  try {
    browser = await chromium.launch({ executablePath: CHROMIUM, args: ['--no-sandbox', '--disable-gpu', '--disable-dev-shm-usage'] });
  } catch (error) {
    console.log(`  skipped: Chromium did not start (${(error as Error).message.split('\n')[0]})`);
    return;
  }
  try {
    const page = await browser.newPage({ viewport: { width: 1280, height: 900 } });
    await page.setContent('<!doctype html><html><body></body></html>');
    await page.addScriptTag({ content: bundle });
    const timings = await page.evaluate((runs) => (window as unknown as { plannerBench: (n: number) => Timing[] }).plannerBench(runs), RUNS);
    for (const t of timings) {
      const verdict = t.p95Ms < BUDGET_MS ? 'within' : 'OVER';
      console.log(`  ${t.label}: median ${t.medianMs.toFixed(2)} ms, p95 ${t.p95Ms.toFixed(2)} ms, max ${t.maxMs.toFixed(2)} ms over ${t.runs} changes, ${t.draws} draws — p95 ${verdict} the ${BUDGET_MS} ms budget`);
    }
  } finally {
    await browser.close();
  }
}

if (process.argv[1] && import.meta.url === `file://${process.argv[1]}`) await runPlannerBench();
