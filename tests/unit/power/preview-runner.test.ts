import { describe, expect, it } from 'vitest';
import { createPowerSimulator, mergeTallies, summarisePower } from '@/lib/design/power';
import { PowerPreviewRunner, type PreviewState } from '@/lib/client/power-preview-runner';
import { answerPreviewChunk, previewScenario, type PreviewChunkReply, type PreviewChunkRequest, type PreviewInput } from '@/lib/shared/power-preview';
import { powerDesign } from '../../support/frozen-design';

/** A stand-in for the Web Worker: answers each message a tick later with the worker's own function. */
class TickWorker {
  onmessage: ((event: MessageEvent<PreviewChunkReply>) => void) | null = null;
  onerror: ((event: ErrorEvent) => void) | null = null;
  requests: PreviewChunkRequest[] = [];
  terminated = false;
  /** Called as each chunk is handed out, before its answer can arrive. */
  onPost: (() => void) | null = null;
  postMessage(request: PreviewChunkRequest) {
    this.requests.push(request);
    this.onPost?.();
    setTimeout(() => {
      if (!this.terminated) this.onmessage?.({ data: answerPreviewChunk(request) } as MessageEvent<PreviewChunkReply>);
    }, 0);
  }
  terminate() {
    this.terminated = true;
  }
}

function input(ratio: number, replications = 30): PreviewInput {
  const content = powerDesign({ ratio });
  return { content, test: { kind: 'sign', alpha: 0.05, alternative: 'greater' }, sampleSizes: [5, 10, 20], replications };
}

function runner(workers: number, states: PreviewState[], debounceMs = 0) {
  const made: TickWorker[] = [];
  let resolve: (state: PreviewState) => void = () => {};
  const finished = new Promise<PreviewState>((r) => (resolve = r));
  const r = new PowerPreviewRunner({
    workers,
    debounceMs,
    chunkSize: 7,
    createWorker: () => {
      const w = new TickWorker();
      made.push(w);
      return w as unknown as Worker;
    },
    onChange: (state) => {
      states.push(state);
      if (state.status === 'done' || state.status === 'error') resolve(state);
    },
  });
  return { runner: r, made, finished };
}

describe('live power preview on workers', () => {
  it('gives the same power as the engine run directly, however the replicates are split over workers', async () => {
    const states: PreviewState[] = [];
    const { runner: r, finished } = runner(2, states);
    r.request(input(0.82));
    const done = await finished;
    const scenario = previewScenario(input(0.82));
    const direct = summarisePower(scenario, createPowerSimulator(scenario).run(0, 30), null);
    expect(done.summary?.points.map((p) => [p.n, p.power, p.lower, p.upper])).toEqual(direct.points.map((p) => [p.n, p.power, p.lower, p.upper]));
    expect(done.summary?.replicates).toBe(30);
    expect(states.map((s) => s.status)).toContain('running');
    expect(states.filter((s) => s.status === 'running').map((s) => s.completed)).toEqual([0, 7, 14, 21, 28]);
  });

  it('cancels the running preview when a newer change comes, and shows only the newer one', async () => {
    const states: PreviewState[] = [];
    const { runner: r, made, finished } = runner(1, states);
    // change a field as soon as the first preview hands out its first chunk (in a microtask, so
    // before that chunk's answer can arrive, however fast or slow the machine is)
    const changed = new Promise<void>((resolve) => {
      made[0].onPost = () => {
        made[0].onPost = null;
        queueMicrotask(() => {
          r.request(input(0.7));
          resolve();
        });
      };
    });
    r.request(input(0.82));
    await changed;
    expect(made[0].requests.length).toBeGreaterThan(0);
    const done = await finished;
    expect(done.summaryInput?.content.spec.ratio).toBe(0.7);
    const scenario = previewScenario(input(0.7));
    const direct = summarisePower(scenario, mergeTallies([createPowerSimulator(scenario).run(0, 30)]), null);
    expect(done.summary?.points.map((p) => p.power)).toEqual(direct.points.map((p) => p.power));
    // the first preview never finished, and at most its chunk already running was simulated
    expect(states.filter((s) => s.status === 'done')).toHaveLength(1);
    const first = made[0].requests.filter((q) => q.input.content.spec.ratio === 0.82);
    expect(first.length).toBeLessThanOrEqual(2);
  });

  it('waits for the changes to settle before simulating anything', async () => {
    const states: PreviewState[] = [];
    const { runner: r, made, finished } = runner(1, states, 30);
    for (const ratio of [0.5, 0.6, 0.7, 0.75, 0.82]) r.request(input(ratio));
    await finished;
    expect(new Set(made[0].requests.map((q) => q.input.content.spec.ratio))).toEqual(new Set([0.82]));
  });

  it('says why a design cannot be previewed instead of showing a curve', async () => {
    const states: PreviewState[] = [];
    const { runner: r, finished } = runner(1, states);
    // a prior whose medians have no reversal zone: the engine refuses the design
    const flat = input(0.82);
    flat.content = { ...flat.content, prior: { ...flat.content.prior, medianSmall: 0.001, medianLarge: 0.01 } };
    r.request(flat);
    const done = await finished;
    expect(done.status).toBe('error');
    expect(done.error).toMatch(/prior/);
    expect(done.summary).toBeNull();
  });

  it('ends its workers when the page leaves', () => {
    const { runner: r, made } = runner(2, []);
    r.dispose();
    expect(made.every((w) => w.terminated)).toBe(true);
  });
});
