import { readFile } from 'node:fs/promises';
import path from 'node:path';
import { pathToFileURL } from 'node:url';
import { describe, expect, it } from 'vitest';
import { workerFile } from '@/lib/server/jobs/worker-bundle';
import { createThreadPool } from '@/lib/server/jobs/thread-pool';
import type { ChunkResult, ChunkTask } from '@/lib/server/jobs/power/worker';
import { runChunk } from '@/lib/server/jobs/power/worker';
import { smallPowerScenario } from '../../support/frozen-design';

const scenario = smallPowerScenario({ replications: 6, seed: 3 });

describe('worker threads load their job as one plain-JavaScript bundle', () => {
  it('writes each job once under .data/workers, named by its content, with no TypeScript left to compile', async () => {
    for (const job of ['power', 'analysis'] as const) {
      const file = await workerFile(job);
      expect(path.relative(process.cwd(), file)).toMatch(new RegExp(`^\\.data/workers/${job}-[0-9a-f]{16}\\.mjs$`));
      expect(await workerFile(job)).toBe(file);
      const loaded = (await import(pathToFileURL(file).href)) as Record<string, unknown>;
      expect(typeof loaded[job === 'power' ? 'runChunk' : 'refitChunk']).toBe('function');
      // every import left in the bundle is a Node built-in or an npm package: no relative source path
      const code = await readFile(file, 'utf8');
      const specifiers = [...code.matchAll(/^import .* from "([^"]+)";$/gm)].map((m) => m[1]);
      expect(specifiers.filter((s) => s.startsWith('.') || s.startsWith('@/'))).toEqual([]);
    }
  });

  it('gives a pool of threads the same tallies as the engine run in this thread, chunk for chunk', async () => {
    const pool = await createThreadPool<ChunkTask, ChunkResult>('power', 2);
    try {
      const key = 'bundle-test';
      const chunks = [
        [0, 3],
        [3, 6],
      ] as const;
      const threaded = await Promise.all(chunks.map(([from, to], index) => pool.run({ key, index, scenario, from, to })));
      const direct = chunks.map(([from, to], index) => runChunk({ key: `${key}-direct`, index, scenario, from, to }));
      expect(threaded).toEqual(direct);
    } finally {
      await pool.destroy();
    }
  });
});
