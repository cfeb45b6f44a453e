import { describe, expect, it } from 'vitest';
import { createPowerSimulator, mergeTallies } from '@/lib/design/power';
import { PINNED_SCENARIOS } from './fixtures/pinned-scenarios';
import pinned from './fixtures/pinned-tallies.json';

// A regression pin, not a reference: pinned-tallies.json holds what the engine gave for these seeded
// scenarios before its replicate loop was made faster (fixtures/generate-pinned-tallies.ts). Changes meant
// to leave results unchanged for the same seed must reproduce every count exactly.
describe('the same seed gives the same results', () => {
  it.each(Object.keys(PINNED_SCENARIOS))('reproduces the pinned tallies of %s', (name) => {
    const scenario = PINNED_SCENARIOS[name];
    expect(createPowerSimulator(scenario).run(0, scenario.replications)).toEqual((pinned as Record<string, unknown>)[name]);
  });

  it('reproduces them when the replicates are split over two simulators (two worker threads)', () => {
    const scenario = PINNED_SCENARIOS['s1-like mcnemar'];
    const half = scenario.replications >> 1;
    const parts = [createPowerSimulator(scenario).run(half, scenario.replications), createPowerSimulator(scenario).run(0, half)];
    expect(mergeTallies(parts)).toEqual(pinned['s1-like mcnemar']);
  });
});
