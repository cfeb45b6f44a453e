import { DesignInputError } from '../DesignInputError';
import type { ParticipantData } from './types';

/** Exclusion rules, stated before looking at the results; each on or off. */
export type ExclusionRules = {
  /** exclude participants who failed the calibration attention check */
  attentionCheck: boolean;
  /** exclude participants whose calibration estimates were flagged (served the fallback set) */
  flaggedEstimates: boolean;
  /** exclude participants with an unanswered calibration item or pair view, or no pairs */
  incompleteBlocks: boolean;
  /** exclude participants with any recorded response time below `ms` milliseconds */
  responseTimeFloor: { enabled: boolean; ms: number };
};

export type ExclusionRuleName = 'attentionCheck' | 'flaggedEstimates' | 'incompleteBlocks' | 'responseTimeFloor';
export const EXCLUSION_RULES: readonly ExclusionRuleName[] = ['attentionCheck', 'flaggedEstimates', 'incompleteBlocks', 'responseTimeFloor'];

export type ExclusionReport = {
  kept: ParticipantData[];
  excluded: Array<{ participantId: string; reasons: ExclusionRuleName[] }>;
  /** per rule: whether it is on, participants it applies to (on or off), and those it removes in the order listed (on rules only) */
  rules: Array<{ rule: ExclusionRuleName; enabled: boolean; applies: number; removes: number }>;
};

/**
 * Applies the exclusion rules. Each rule reports how many participants it applies to whether
 * or not it is on (so a team sees what turning it on would cost), and how many it removes when
 * the rules are applied in the listed order (a participant caught by several rules is removed
 * by the first). The response-time rule reads only recorded times; a participant without any
 * is never removed by it.
 *
 * @throws DesignInputError naming `rules.…` for a missing switch or a floor that is not a finite number ≥ 0
 * @example applyExclusions([], { attentionCheck: true, flaggedEstimates: false, incompleteBlocks: true, responseTimeFloor: { enabled: false, ms: 0 } }).kept.length // 0
 */
export function applyExclusions(participants: readonly ParticipantData[], rules: ExclusionRules): ExclusionReport {
  checkRules(rules);
  const tests: Record<ExclusionRuleName, (p: ParticipantData) => boolean> = {
    attentionCheck: (p) => p.attentionCheck === 'failed',
    flaggedEstimates: (p) => p.estimateFlag !== null,
    incompleteBlocks: (p) => p.pairs.length === 0 || p.calibration.some((c) => c.choice === null) || p.pairs.some((q) => q.far.choice === null || q.near.choice === null),
    responseTimeFloor: (p) => allChoices(p).some((t) => typeof t === 'number' && t < rules.responseTimeFloor.ms),
  };
  const enabled: Record<ExclusionRuleName, boolean> = {
    attentionCheck: rules.attentionCheck,
    flaggedEstimates: rules.flaggedEstimates,
    incompleteBlocks: rules.incompleteBlocks,
    responseTimeFloor: rules.responseTimeFloor.enabled,
  };
  const report: ExclusionReport = { kept: [], excluded: [], rules: EXCLUSION_RULES.map((rule) => ({ rule, enabled: enabled[rule], applies: 0, removes: 0 })) };
  for (const p of participants) {
    const reasons: ExclusionRuleName[] = [];
    let removedBy: number | null = null;
    EXCLUSION_RULES.forEach((rule, j) => {
      if (!tests[rule](p)) return;
      report.rules[j].applies++;
      if (!enabled[rule]) return;
      reasons.push(rule);
      if (removedBy === null) removedBy = j;
    });
    if (removedBy === null) report.kept.push(p);
    else {
      report.rules[removedBy].removes++;
      report.excluded.push({ participantId: p.participantId, reasons });
    }
  }
  return report;
}

function allChoices(p: ParticipantData): Array<number | null | undefined> {
  return [...p.calibration.map((c) => c.responseTimeMs), ...p.pairs.flatMap((q) => [q.far.responseTimeMs, q.near.responseTimeMs])];
}

function checkRules(rules: ExclusionRules): void {
  if (rules === null || typeof rules !== 'object') throw new DesignInputError('rules', 'an object of exclusion switches', rules);
  for (const name of ['attentionCheck', 'flaggedEstimates', 'incompleteBlocks'] as const) {
    if (typeof rules[name] !== 'boolean') throw new DesignInputError(`rules.${name}`, 'true or false', rules[name]);
  }
  const floor = rules.responseTimeFloor;
  if (floor === null || typeof floor !== 'object' || typeof floor.enabled !== 'boolean') throw new DesignInputError('rules.responseTimeFloor.enabled', 'true or false', floor?.enabled);
  if (!(floor.ms >= 0 && floor.ms < Infinity)) throw new DesignInputError('rules.responseTimeFloor.ms', 'a finite number of milliseconds, 0 or more', floor.ms);
}
