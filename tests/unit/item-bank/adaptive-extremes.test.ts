import { describe, expect, it } from 'vitest';
import { DesignInputError, nextCalibrationItem, type BankItem } from '@/lib/design';
import { bankFor } from '@/lib/shared/item-bank-plan';
import { frozenDesignSchema, type FrozenDesign } from '@/lib/shared/validations/planner';
import { frozenDesign, HASH } from '../../support/frozen-design';

// Adaptive calibration over the schema's whole range: every extreme the design schema lets through, one
// field at a time, with the stop rule at both ends, builds a bank and takes steps without any throw other
// than the core's named input error (which the API answers as 422 naming the field).
const EXTREMES: Record<string, number[]> = {
  'prior.medianSmall': [Number.MIN_VALUE, 1e-12, 10],
  'prior.medianLarge': [Number.MIN_VALUE, 1e-12, 10],
  'prior.sdLogSmall': [0, 5],
  'prior.sdLogLarge': [0, 5],
  'prior.correlation': [-0.99, 0.99],
  'spec.model.sensitivity': [0.01, 5],
  'spec.ratio': [1e-12, 0.9999999999999999],
  'spec.largeAmount': [1e-12, 1_000_000],
  'spec.choiceSensitivity': [1e-12, 1000],
  'spec.calibration.minDelay': [1, 9130],
  'spec.calibration.maxDelay': [2, 9131],
  'spec.calibration.adaptive.maxItems': [2, 80],
  'spec.calibration.adaptive.targetSd': [0, 2],
};

function withField(content: FrozenDesign, path: string, value: number): unknown {
  const copy = JSON.parse(JSON.stringify(content)) as Record<string, unknown>;
  const keys = path.split('.');
  let node = copy;
  for (const key of keys.slice(0, -1)) node = node[key] as Record<string, unknown>;
  node[keys.at(-1)!] = value;
  if (path === 'spec.calibration.minDelay') (copy.spec as { calibration: { maxDelay: number } }).calibration.maxDelay = 9131;
  return copy;
}

const bases = [
  frozenDesign({ calibration: { itemsPerMagnitude: 4, minDelay: 1, maxDelay: 180, adaptive: { maxItems: 6, targetSd: 0.3 } } }),
  frozenDesign({ model: { id: 'hyperboloid', sensitivity: 0.8 }, calibration: { itemsPerMagnitude: 4, minDelay: 1, maxDelay: 180, adaptive: { maxItems: 6, targetSd: 0.3 } } }),
];

describe('adaptive calibration at the schema’s extremes', { timeout: 120_000 }, () => {
  for (const [field, values] of Object.entries(EXTREMES)) {
    it(`${field} never crashes the bank or a step`, () => {
      const crashes: string[] = [];
      for (const base of bases) {
        for (const value of values) {
          const parsed = frozenDesignSchema.safeParse(withField(base, field, value));
          if (!parsed.success) continue;
          const content = parsed.data;
          try {
            const { bank } = bankFor({ hash: HASH, content });
            const answers: { itemId: string; chosen: 'sooner' | 'later' }[] = [];
            for (let n = 0; n < 3; n++) {
              const step = nextCalibrationItem(content, bank, { participantId: 'X', answers });
              expect(Number.isFinite(step.estimates.kSmall.rate) && step.estimates.kSmall.rate > 0).toBe(true);
              if (step.done) break;
              answers.push({ itemId: (step.item as BankItem).id, chosen: n % 2 ? 'later' : 'sooner' });
            }
          } catch (error) {
            if (!(error instanceof DesignInputError)) crashes.push(`${content.spec.model.id} ${field}=${value}: ${(error as Error).name}: ${(error as Error).message}`);
          }
        }
      }
      expect(crashes).toEqual([]);
    });
  }
});
