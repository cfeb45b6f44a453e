// Plain-JavaScript start of a refit worker thread (the thread pool's entry): registers tsx for this
// thread and re-exports the TypeScript task, so threads run the same analysis source everywhere.
import { tsImport } from 'tsx/esm/api';

const entry = await tsImport('./worker.ts', import.meta.url);

export default entry.refitChunk;
