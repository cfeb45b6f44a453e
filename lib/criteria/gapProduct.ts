import { preferenceGaps, type QuestionPair } from '@/lib/design';

/**
 * The gap product C = A·B of a question pair (docs/mathematics.md): far-view gap for LL times near-view
 * gap for SS, in squared units of the large amount. Outside the reversal zone the product is
 * not a measure of anything (two negative gaps would multiply to a positive number), so it is
 * reported as 0 there.
 *
 * @throws DesignInputError for any field out of range
 * @example gapProduct({ model: { id: 'hyperbolic' }, ratio: 0.5, soonDelay: 10, lateDelay: 40, kSmall: 0.1, kLarge: 0.05 }) // (1/3 − 1/4)·(1/2 − 2/5) = 1/120
 */
export function gapProduct(pair: QuestionPair): number {
  const { far, near } = preferenceGaps(pair);
  return far > 0 && near > 0 ? far * near : 0;
}
