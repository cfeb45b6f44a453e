import { preferenceGaps } from './preferenceGaps';
import type { ChoicePattern, QuestionPair } from './types';

/**
 * The choice pattern a noiseless chooser shows on a question pair, far view first:
 * far letter L when A > 0, else S; near letter S when B > 0, else L. Ties (A = 0 or B = 0)
 * count as "not strictly preferred", so LS holds exactly on the open reversal zone.
 *
 * @throws DesignInputError for any field out of range
 * @example predictPattern({ model: { id: 'hyperbolic' }, ratio: 0.5, soonDelay: 10, lateDelay: 40, kSmall: 0.1, kLarge: 0.05 }) // 'LS'
 */
export function predictPattern(input: QuestionPair): ChoicePattern {
  const { far, near } = preferenceGaps(input);
  if (far > 0) return near > 0 ? 'LS' : 'LL';
  return near > 0 ? 'SS' : 'SL';
}
