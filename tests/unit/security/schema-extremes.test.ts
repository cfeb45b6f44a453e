// Values a schema accepts must never crash later: for every numeric field of the design, prior
// and power schemas, the extremes each schema allows (its bounds, and values just inside an open
// bound) either compute — the design summary, the item bank, a short power simulation — or fail
// with the core's DesignInputError (a 422 naming the field). Any other throw is a 500 waiting.
import { describe, expect, it } from 'vitest';
import { ZodError } from 'zod';
import { DesignInputError } from '@/lib/design';
import { createPowerSimulator } from '@/lib/design/power';
import { bankFor } from '@/lib/shared/item-bank-plan';
import { computeDesignSummary } from '@/lib/shared/planner/summary';
import { buildScenario } from '@/lib/shared/power-scenario';
import { frozenDesignSchema, MODEL_CHOICES, type FrozenDesign } from '@/lib/shared/validations/planner';
import { powerRunSpecSchema } from '@/lib/shared/validations/power';
import { frozenDesign as design, HASH } from '../../support/frozen-design';

const TINY = [Number.MIN_VALUE, 1e-300, 1e-12];

/** Extremes per field: what the schema's bounds let through, and a little beyond (the schema must refuse those). */
const DESIGN_FIELDS: Record<string, number[]> = {
  'prior.medianSmall': [...TINY, 10],
  'prior.medianLarge': [...TINY, 10],
  'prior.sdLogSmall': [0, 5],
  'prior.sdLogLarge': [0, 5],
  'prior.correlation': [-0.99, 0.99],
  'spec.model.sensitivity': [...TINY, 5],
  'spec.model.presentBias': [...TINY, 1],
  'spec.ratio': [...TINY, 0.9999999999999999],
  'spec.largeAmount': [...TINY, 1_000_000],
  'spec.choiceSensitivity': [...TINY, 1000],
  'spec.lateDelayLimit': [2, 15, 9131],
  'spec.soonDelay.days': [0, 1, 365],
  'spec.probePairs': [1, 20],
  'spec.lateAnchors': [0, 10],
  'spec.soonAnchors': [0, 10],
  'spec.calibration.itemsPerMagnitude': [4, 40],
  'spec.calibration.minDelay': [1, 9130],
  'spec.calibration.maxDelay': [2, 9131],
};

function withField(content: FrozenDesign, path: string, value: number): unknown {
  const copy = JSON.parse(JSON.stringify(content)) as Record<string, unknown>;
  const keys = path.split('.');
  let node = copy as Record<string, unknown>;
  for (const key of keys.slice(0, -1)) node = node[key] as Record<string, unknown>;
  node[keys.at(-1)!] = value;
  if (path === 'spec.soonDelay.days' && value === 365) (copy.spec as { lateDelayLimit: number }).lateDelayLimit = 9131;
  if (path === 'spec.calibration.minDelay') (copy.spec as { calibration: { maxDelay: number } }).calibration.maxDelay = 9131;
  return copy;
}

/** Runs `compute`; returns a description of any throw that is not the core's named input error. */
function crashOf(compute: () => unknown): string | null {
  try {
    compute();
    return null;
  } catch (error) {
    return error instanceof DesignInputError ? null : `${(error as Error).name}: ${(error as Error).message}`;
  }
}

const bases: FrozenDesign[] = MODEL_CHOICES.flatMap((id) =>
  (['personalised', 'population'] as const).map((mode) =>
    design({ mode, model: { id, ...(id === 'hyperboloid' || id === 'power-delay' || id === 'exponential-power' ? { sensitivity: 0.8 } : {}), ...(id === 'quasi-hyperbolic' ? { presentBias: 0.8 } : {}) } }),
  ),
);

describe('schema-accepted extremes never crash the planner or the item bank', { timeout: 60_000 }, () => {
  for (const [field, values] of Object.entries(DESIGN_FIELDS)) {
    it(`${field}`, () => {
      const crashes: string[] = [];
      for (const base of bases) {
        for (const value of values) {
          const parsed = frozenDesignSchema.safeParse(withField(base, field, value));
          if (!parsed.success) continue; // refused with 422 naming the field: fine
          const content = parsed.data;
          const where = `${content.spec.model.id}/${content.spec.mode} ${field}=${value}`;
          const summary = crashOf(() => computeDesignSummary({ spec: content.spec, prior: content.prior }));
          if (summary) crashes.push(`summary ${where}: ${summary}`);
          const bank = crashOf(() => bankFor({ hash: HASH, content }));
          if (bank) crashes.push(`item bank ${where}: ${bank}`);
        }
      }
      expect(crashes).toEqual([]);
    });
  }
});

describe('all fields at their extremes at once never crash the planner or the item bank', { timeout: 60_000 }, () => {
  const corners = {
    low: { ratio: Number.MIN_VALUE, largeAmount: Number.MIN_VALUE, choiceSensitivity: Number.MIN_VALUE, lateDelayLimit: 2, soonDelay: { mode: 'fixed', days: 0 }, probePairs: 1, lateAnchors: 0, soonAnchors: 0, calibration: { itemsPerMagnitude: 4, minDelay: 1, maxDelay: 2 } },
    high: { ratio: 0.9999999999999999, largeAmount: 1_000_000, choiceSensitivity: 1000, lateDelayLimit: 9131, soonDelay: { mode: 'optimised', min: 0, max: 365 }, probePairs: 20, lateAnchors: 10, soonAnchors: 10, calibration: { itemsPerMagnitude: 40, minDelay: 1, maxDelay: 9131 } },
  };
  const priors = {
    low: { medianSmall: Number.MIN_VALUE, medianLarge: Number.MIN_VALUE, sdLogSmall: 0, sdLogLarge: 0, correlation: -0.99 },
    high: { medianSmall: 10, medianLarge: 10, sdLogSmall: 5, sdLogLarge: 5, correlation: 0.99 },
  };
  for (const [specCorner, spec] of Object.entries(corners)) {
    for (const [priorCorner, prior] of Object.entries(priors)) {
      // One test per model, so each stays well inside its time limit on a loaded machine.
      it.each(MODEL_CHOICES)(`design fields ${specCorner}, prior fields ${priorCorner}, model %s`, (id) => {
        const crashes: string[] = [];
        for (const s of [0.01, 5]) {
          for (const mode of ['personalised', 'population'] as const) {
            for (const criterion of ['gap-product', 'expected-reversal-rate', 'maximin'] as const) {
              const model = { id, ...(id === 'hyperboloid' || id === 'power-delay' || id === 'exponential-power' ? { sensitivity: s } : {}), ...(id === 'quasi-hyperbolic' ? { presentBias: s === 5 ? 1 : Number.MIN_VALUE } : {}) };
              let built: FrozenDesign;
              try {
                built = design({ mode, criterion, model, ...(spec as object) }, prior);
              } catch (error) {
                // the one save-time refusal a corner may meet: a present bias too small for any question to measure
                expect(error instanceof ZodError && error.issues.every((i) => i.path.join('.') === 'spec.model.presentBias'), String(error)).toBe(true);
                continue;
              }
              const parsed = frozenDesignSchema.safeParse(JSON.parse(JSON.stringify(built)));
              if (!parsed.success) continue;
              const content = parsed.data;
              const where = `${id} s=${s} ${mode} ${criterion}`;
              const summary = crashOf(() => computeDesignSummary({ spec: content.spec, prior: content.prior }));
              if (summary) crashes.push(`summary ${where}: ${summary}`);
              const bank = crashOf(() => bankFor({ hash: HASH, content }));
              if (bank) crashes.push(`item bank ${where}: ${bank}`);
            }
          }
        }
        expect(crashes).toEqual([]);
      });
    }
  }
});

const POWER_FIELDS: Record<string, number[]> = {
  'truth.gamma': [...TINY, 1000],
  'truth.lapse': [0, 0.5],
  'truth.prior.medianSmall': [...TINY, 10],
  'truth.prior.medianLarge': [...TINY, 10],
  'truth.prior.sdLogSmall': [0, 5],
  'truth.model.sensitivity': [...TINY, 5],
  'truth.model.presentBias': [...TINY, 1],
  'test.alpha': [...TINY, 0.5],
};

describe('schema-accepted extremes never crash a power simulation', { timeout: 60_000 }, () => {
  const content = design({ model: { id: 'hyperboloid', sensitivity: 0.8 } });
  for (const [field, values] of Object.entries(POWER_FIELDS)) {
    it(`${field}`, () => {
      const crashes: string[] = [];
      for (const value of values) {
        for (const calibration of ['simulated', 'known'] as const) {
          const spec: Record<string, unknown> = {
            designVersionId: 1,
            truth: { model: { id: 'hyperboloid', sensitivity: 0.8 }, prior: { medianSmall: 0.02, medianLarge: 0.008, sdLogSmall: 0.8, sdLogLarge: 0.8, correlation: 0.5 }, gamma: 10, lapse: 0.02 },
            calibration,
            test: { kind: 'mcnemar', alpha: 0.05, alternative: 'greater' },
            sampleSizes: [5, 10],
            replications: 10,
            seed: 7,
          };
          const keys = field.split('.');
          let node = spec;
          for (const key of keys.slice(0, -1)) node = node[key] as Record<string, unknown>;
          node[keys.at(-1)!] = value;
          const parsed = powerRunSpecSchema.safeParse(spec);
          if (!parsed.success) continue;
          const crash = crashOf(() => createPowerSimulator(buildScenario(parsed.data, content)).run(0, 10));
          if (crash) crashes.push(`${field}=${value} (${calibration}): ${crash}`);
        }
      }
      expect(crashes).toEqual([]);
    });
  }
});

// A run the start accepted must finish: the start builds the simulator (its DesignInputError is
// the 422), so any throw from run() afterwards is a run the user sees only as failed.
describe('a power run of a frozen design at its field extremes either is refused at the start or runs', { timeout: 120_000 }, () => {
  // The planner's defaults (four probes, two anchors of each kind) per model and mode.
  const runBases = MODEL_CHOICES.flatMap((id) =>
    (['personalised', 'population'] as const).map((mode) =>
      design(
        { mode, model: { id, ...(id === 'hyperboloid' || id === 'power-delay' || id === 'exponential-power' ? { sensitivity: 0.8 } : {}), ...(id === 'quasi-hyperbolic' ? { presentBias: 0.8 } : {}) }, probePairs: 4, lateAnchors: 2, soonAnchors: 2, calibration: { itemsPerMagnitude: 10, minDelay: 7, maxDelay: 365 }, choiceSensitivity: 10 },
        { correlation: 0.6 },
      ),
    ),
  );
  const truthOf = (content: FrozenDesign) => ({ model: content.spec.model, prior: { medianSmall: 0.02, medianLarge: 0.008, sdLogSmall: 0.8, sdLogLarge: 0.8, correlation: 0.6 }, gamma: 10, lapse: 0.02 });
  for (const [field, values] of Object.entries(DESIGN_FIELDS)) {
    it(`${field}`, () => {
      const failures: string[] = [];
      for (const base of runBases) {
        for (const value of values) {
          const parsedDesign = frozenDesignSchema.safeParse(withField(base, field, value));
          if (!parsedDesign.success) continue;
          const run = powerRunSpecSchema.parse({ designVersionId: 1, truth: truthOf(parsedDesign.data), calibration: 'simulated', test: { kind: 'mcnemar', alpha: 0.05, alternative: 'greater' }, sampleSizes: [5], replications: 10, seed: 1 });
          let simulator: ReturnType<typeof createPowerSimulator>;
          try {
            simulator = createPowerSimulator(buildScenario(run, parsedDesign.data));
          } catch (error) {
            if (!(error instanceof DesignInputError)) failures.push(`${field}=${value} (${base.spec.model.id}, ${base.spec.mode}) start: ${(error as Error).message}`);
            continue;
          }
          try {
            simulator.run(0, 10);
          } catch (error) {
            failures.push(`${field}=${value} (${base.spec.model.id}, ${base.spec.mode}) run: ${(error as Error).message}`);
          }
        }
      }
      expect(failures).toEqual([]);
    });
  }
});
