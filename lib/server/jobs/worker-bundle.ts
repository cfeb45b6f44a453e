import { createHash, randomUUID } from 'node:crypto';
import { mkdir, readdir, rename, rm, stat, writeFile } from 'node:fs/promises';
import path from 'node:path';
import { build } from 'esbuild';

export type ThreadJob = 'power' | 'analysis';

const built = new Map<ThreadJob, Promise<string>>();

/**
 * The file a worker thread of `job` loads: lib/server/jobs/<job>/worker.ts and the engine it
 * imports, bundled by esbuild into one plain ES module under .data/workers, named by its content's
 * hash. Threads then start by loading plain JavaScript instead of compiling every source file of
 * the engine through a TypeScript loader of their own, which cost each thread about a third of a
 * second. npm packages stay outside the bundle (resolved from the project's node_modules).
 *
 * Built once per process (a few tens of milliseconds); in development, on every call, so an edited
 * engine is what the next run uses. The file is written to a temporary name and renamed, so a
 * process that finds the name finds it whole. The project root is process.cwd(), as everywhere
 * the app runs (next, vitest, `npm run worker`, the benchmarks).
 */
export function workerFile(job: ThreadJob): Promise<string> {
  const cached = built.get(job);
  if (cached && process.env.NODE_ENV !== 'development') return cached;
  const pending = bundle(job);
  built.set(job, pending);
  pending.catch(() => built.delete(job)); // a failed build is tried again next time
  return pending;
}

async function bundle(job: ThreadJob): Promise<string> {
  const root = process.cwd();
  const result = await build({
    absWorkingDir: root,
    entryPoints: [path.join('lib', 'server', 'jobs', job, 'worker.ts')],
    bundle: true,
    format: 'esm',
    platform: 'node',
    target: 'node20',
    packages: 'external',
    write: false,
    logLevel: 'silent',
  });
  const code = result.outputFiles[0].contents;
  const hash = createHash('sha256').update(code).digest('hex').slice(0, 16);
  const dir = path.join(root, '.data', 'workers');
  const file = path.join(dir, `${job}-${hash}.mjs`);
  if (await exists(file)) return file;
  await mkdir(dir, { recursive: true });
  const temporary = `${file}.${randomUUID()}.tmp`;
  await writeFile(temporary, code);
  await rename(temporary, file);
  await removeStale(dir, job, file);
  return file;
}

// Bundles of earlier sources (development edits, older releases) an hour after they were written:
// by then no process of this checkout still starts threads from them.
const STALE_MS = 60 * 60 * 1000;

async function removeStale(dir: string, job: ThreadJob, keep: string): Promise<void> {
  for (const name of await readdir(dir)) {
    const file = path.join(dir, name);
    if (file === keep || !name.startsWith(`${job}-`)) continue;
    const info = await stat(file).catch(() => null);
    if (info && Date.now() - info.mtimeMs > STALE_MS) await rm(file, { force: true });
  }
}

async function exists(file: string): Promise<boolean> {
  try {
    await stat(file);
    return true;
  } catch {
    return false;
  }
}
