import { describe, expect, it } from 'vitest';
import { refitParticipant, simulateStudy } from '@/lib/design';
import { runRefits } from '@/lib/server/jobs/analysis/run-refits';
import { design, truth } from './support';

describe('refits on worker threads', () => {
  it('give exactly the refits of the participants one by one, in their order', async () => {
    const data = simulateStudy({ design: design(), truth: truth({ id: 'hyperbolic' }, 10), participants: 9, seed: 12 });
    const options = { model: { id: 'hyperbolic' as const }, choice: { sensitivity: 10 } };
    const threaded = await runRefits(data, { ...options, workers: 2 });
    expect(threaded).toEqual(data.map((p) => refitParticipant(p, options)));
  }, 60_000);
});
