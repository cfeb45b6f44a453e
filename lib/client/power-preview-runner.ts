import { summarisePower, type PowerSummary } from '@/lib/design/power/summarisePower';
import { mergeTallies } from '@/lib/design/power/tally';
import type { PowerScenario, PowerTally } from '@/lib/design/power/types';
import { type PreviewChunkReply, type PreviewChunkRequest, type PreviewInput } from '@/lib/shared/power-preview';

/** Where a preview stands, as the page shows it. */
export type PreviewState = {
  /** idle: nothing asked; waiting: a change is settling (debounce); running: chunks out; done; error */
  status: 'idle' | 'waiting' | 'running' | 'done' | 'error';
  completed: number;
  total: number;
  /** the latest finished preview (kept while a newer one runs, so the curve does not flicker away) */
  summary: PowerSummary | null;
  /** the input that summary belongs to */
  summaryInput: PreviewInput | null;
  error: string | null;
  /** milliseconds from the change to the finished curve (debounce included) */
  elapsedMs: number | null;
};

export type PreviewRunnerOptions = {
  /** makes one Web Worker running power-preview.worker.ts */
  createWorker: () => Worker;
  /** workers to split the replicates over; default one per core, 1 to 4 */
  workers?: number;
  /** quiet time after a change before the preview starts, ms; default 200 */
  debounceMs?: number;
  /** replicates per chunk: a newer change waits at most one chunk per worker; default 20 */
  chunkSize?: number;
  onChange: (state: PreviewState) => void;
};

/**
 * Runs the design page's power preview on Web Workers. Each change (request) cancels the preview
 * in flight at once: its generation number is retired, chunks not yet handed out are dropped and
 * replies from chunks already running are ignored, so a worker is free again within one chunk.
 * After `debounceMs` without a newer change, the replicates are handed out chunk by chunk and the
 * tallies merged (whole-number counts: the result does not depend on the split); the finished
 * tally is summarised (power with Wilson intervals per sample size). The page's thread only posts
 * messages and adds counts: typing never waits for the simulation.
 */
export class PowerPreviewRunner {
  private readonly workers: Worker[];
  private readonly idle: Worker[];
  private readonly debounceMs: number;
  private readonly chunkSize: number;
  private replications = 0;
  private generation = 0;
  private timer: ReturnType<typeof setTimeout> | null = null;
  private queue: Array<{ from: number; to: number }> = [];
  private parts: PowerTally[] = [];
  private input: PreviewInput | null = null;
  private scenario: PowerScenario | null = null;
  private longest: number | null = null;
  private changedAt = 0;
  private state: PreviewState = { status: 'idle', completed: 0, total: 0, summary: null, summaryInput: null, error: null, elapsedMs: null };

  constructor(private readonly options: PreviewRunnerOptions) {
    const count = options.workers ?? defaultPreviewWorkers();
    this.debounceMs = options.debounceMs ?? 200;
    this.chunkSize = options.chunkSize ?? 20;
    this.workers = Array.from({ length: count }, () => {
      const worker = options.createWorker();
      worker.onmessage = (event: MessageEvent<PreviewChunkReply>) => this.receive(worker, event.data);
      worker.onerror = (event) => {
        event.preventDefault();
        this.fail(event.message || 'The preview worker stopped.');
      };
      return worker;
    });
    this.idle = [...this.workers];
  }

  /** A change: cancels the running preview and starts this one after the quiet time (null: show nothing new). */
  request(input: PreviewInput | null): void {
    this.generation++;
    this.queue = [];
    if (this.timer !== null) clearTimeout(this.timer);
    this.timer = null;
    if (input === null) {
      this.update({ status: 'idle', completed: 0, total: 0, error: null });
      return;
    }
    this.changedAt = performance.now();
    this.update({ status: 'waiting', completed: 0, total: input.replications, error: null, elapsedMs: null });
    const generation = this.generation;
    this.timer = setTimeout(() => this.start(generation, input), this.debounceMs);
  }

  /** Stops everything and ends the workers (the page is leaving). */
  dispose(): void {
    this.generation++;
    if (this.timer !== null) clearTimeout(this.timer);
    for (const worker of this.workers) worker.terminate();
  }

  private start(generation: number, input: PreviewInput): void {
    if (generation !== this.generation) return;
    this.timer = null;
    this.input = input;
    this.replications = input.replications;
    this.scenario = null;
    this.parts = [];
    this.queue = [];
    for (let from = 0; from < this.replications; from += this.chunkSize) this.queue.push({ from, to: Math.min(this.replications, from + this.chunkSize) });
    this.update({ status: 'running' });
    while (this.idle.length > 0 && this.queue.length > 0) this.send(this.idle.pop()!);
  }

  private send(worker: Worker): void {
    const chunk = this.queue.shift();
    if (!chunk || !this.input) {
      this.idle.push(worker);
      return;
    }
    const request: PreviewChunkRequest = { generation: this.generation, input: this.input, from: chunk.from, to: chunk.to };
    worker.postMessage(request);
  }

  private receive(worker: Worker, reply: PreviewChunkReply): void {
    if (reply.generation !== this.generation) {
      this.send(worker); // a cancelled preview's chunk: the worker takes the current preview's next one
      return;
    }
    if (reply.error !== undefined) {
      this.queue = [];
      this.idle.push(worker);
      this.fail(reply.error);
      return;
    }
    this.parts.push(reply.tally);
    this.scenario = reply.scenario;
    this.longest = reply.longestCalibrationDelay;
    const completed = this.state.completed + (reply.to - reply.from);
    if (completed < this.replications) {
      this.update({ completed });
      this.send(worker);
      return;
    }
    this.idle.push(worker);
    const summary = summarisePower(this.scenario, mergeTallies(this.parts), this.longest);
    this.update({ status: 'done', completed, summary, summaryInput: this.input, elapsedMs: performance.now() - this.changedAt });
  }

  private fail(message: string): void {
    this.generation++;
    this.update({ status: 'error', error: message });
  }

  private update(patch: Partial<PreviewState>): void {
    this.state = { ...this.state, ...patch };
    this.options.onChange(this.state);
  }
}

/**
 * One worker per core, from 1 to 4: the page's own thread only posts messages and adds counts, so
 * it needs no core of its own (the benchmark watches its input handling while they run).
 */
export function defaultPreviewWorkers(): number {
  const cores = typeof navigator !== 'undefined' && navigator.hardwareConcurrency ? navigator.hardwareConcurrency : 2;
  return Math.max(1, Math.min(4, cores));
}
