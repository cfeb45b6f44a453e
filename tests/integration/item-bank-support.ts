// Frozen design versions for the item-bank and probe-API tests, created directly (content valid
// per frozenDesignSchema, hash by contentHash), the way the planner's freeze would store them.
import { Design, DesignVersion } from '@/db/models';
import { contentHash } from '@/lib/shared/canonical-json';
import type { FrozenDesign } from '@/lib/shared/validations/planner';
import { frozenDesign as unitDesign } from '../support/frozen-design';

export function demoContent(overrides: Partial<FrozenDesign['spec']> = {}): FrozenDesign {
  return unitDesign({ name: 'Savings bonus, personalised', ...overrides }, { name: 'Pilot prior' });
}

/** A design and one frozen version of it in `studyId`. */
export async function makeFrozenVersion(studyId: number, content: FrozenDesign = demoContent()) {
  const design = await Design.create({ studyId, name: content.spec.name, spec: content.spec, createdBy: null });
  return DesignVersion.create({ designId: design.id, studyId, number: 1, hash: contentHash(content), content, frozenBy: null });
}

/** Noise-free answers of a hyperbolic chooser with the given rates to the calibration items. */
export function answersOf(items: Array<{ id: string; role: string; magnitude: string | null; soonerAmount: number; laterAmount: number; laterDelay: number }>, rates: { kSmall: number; kLarge: number }) {
  const responses: Record<string, string> = {};
  for (const item of items) {
    if (item.role !== 'calibration') continue;
    const k = item.magnitude === 'small' ? rates.kSmall : rates.kLarge;
    responses[item.id] = item.laterAmount / (1 + k * item.laterDelay) > item.soonerAmount ? 'later' : 'sooner';
  }
  return responses;
}
