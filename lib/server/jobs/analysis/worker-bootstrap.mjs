// Plain-JavaScript start of a refit worker thread: registers tsx for this thread and loads the
// TypeScript entry, so workers run the same analysis source under next dev, next start and vitest.
import { tsImport } from 'tsx/esm/api';

await tsImport('./worker.ts', import.meta.url);
