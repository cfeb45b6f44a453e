import { DesignInputError } from '../DesignInputError';
import type { ChoiceModel } from '../choiceProbability';
import type { ModelId } from '../types';
import { pairPattern } from './participantChoices';
import { pairPatternProbabilities, type PatternCounts } from './patternProbabilities';
import type { ParticipantRefit } from './refitParticipant';
import { ANALYSIS_PAIR_ROLES, type AnalysisPairRole, type ParticipantData } from './types';

/** Where an expected distribution comes from: the design's own calibration estimates, or a model refitted to calibration choices. */
export type ExpectationSource = 'design' | ModelId;

/** Observed and expected pattern counts of one pair role. */
export type RolePatterns = {
  role: AnalysisPairRole;
  /** pairs with both views answered */
  pairs: number;
  participants: number;
  observed: PatternCounts;
  /** expected counts Σ P(pattern) over the same pairs, per source */
  expected: Record<ExpectationSource, PatternCounts>;
};

const zero = (): PatternCounts => ({ LL: 0, LS: 0, SL: 0, SS: 0 });

/**
 * Observed LL/LS/SL/SS counts per pair role (late anchor, reversal probe, soon anchor) beside the
 * counts expected from each participant's calibration estimates: under the design's model and
 * choice model as serving estimated them ('design'), and under each refitted model's
 * calibration-only fit. Expected counts are sums of pattern probabilities
 * (pairPatternProbabilities) over the pairs the participant answered in full, so observed and
 * expected cover the same pairs.
 *
 * @param refits one per participant, in the same order
 * @throws DesignInputError when participants and refits differ in length or order (field 'refits')
 */
export function comparePatterns(participants: readonly ParticipantData[], refits: readonly ParticipantRefit[], choice: ChoiceModel): RolePatterns[] {
  checkAligned(participants, refits);
  const sources: ExpectationSource[] = ['design', ...(refits[0]?.models.map((m) => m.model) ?? [])];
  const rows = new Map<AnalysisPairRole, RolePatterns>();
  const seen = new Map<AnalysisPairRole, Set<string>>();
  for (const role of ANALYSIS_PAIR_ROLES) {
    rows.set(role, { role, pairs: 0, participants: 0, observed: zero(), expected: Object.fromEntries(sources.map((s) => [s, zero()])) as Record<ExpectationSource, PatternCounts> });
    seen.set(role, new Set());
  }
  participants.forEach((participant, i) => {
    const refit = refits[i];
    for (const pair of participant.pairs) {
      const pattern = pairPattern(pair);
      const row = rows.get(pair.role);
      if (pattern === null || row === undefined) continue;
      row.pairs++;
      row.observed[pattern]++;
      seen.get(pair.role)!.add(participant.participantId);
      add(row.expected.design, pairPatternProbabilities(refit.design.model, refit.design.parameters, pair, choice));
      for (const m of refit.models) add(row.expected[m.model], pairPatternProbabilities(m.model, m.calibrationOnly.parameters, pair, choice));
    }
  });
  return ANALYSIS_PAIR_ROLES.map((role) => ({ ...rows.get(role)!, participants: seen.get(role)!.size }));
}

function add(total: PatternCounts, p: PatternCounts): void {
  total.LL += p.LL;
  total.LS += p.LS;
  total.SL += p.SL;
  total.SS += p.SS;
}

/** Participants and refits must line up one to one. */
export function checkAligned(participants: readonly ParticipantData[], refits: readonly ParticipantRefit[]): void {
  if (participants.length !== refits.length || participants.some((p, i) => refits[i].participantId !== p.participantId)) {
    throw new DesignInputError('refits', `one refit per participant, in the participants' order (${participants.length})`, refits.length);
  }
}
