import { DesignInputError } from '../DesignInputError';
import type { FitChoice } from './choiceLikelihood';
import type { ObservedChoice, ObservedPair, ParticipantData } from './types';

/** A participant's answered choices in the refit's form, calibration and stage 2 apart. */
export type ParticipantChoices = { calibration: FitChoice[]; stage2: FitChoice[] };

/**
 * The answered choices of a participant as FitChoices: calibration items value both options with
 * their own magnitude's rate; in every pair view the sooner option is the small reward (rate k)
 * and the later option the large reward (rate K), as docs/mathematics.md defines the gaps. Unanswered
 * items are left out.
 *
 * @throws DesignInputError naming `participants[…].…` for a choice that is not 'sooner', 'later' or null
 * @example participantChoices({ participantId: 'P1', calibration: [], pairs: [], attentionCheck: 'passed', estimateFlag: null }).stage2.length // 0
 */
export function participantChoices(participant: ParticipantData): ParticipantChoices {
  const calibration: FitChoice[] = [];
  participant.calibration.forEach((c, i) => {
    const later = answered(c, `calibration[${i}]`);
    if (later === null) return;
    calibration.push({
      soonerAmount: c.soonerAmount,
      soonerDelay: c.soonerDelay,
      soonerMagnitude: c.magnitude,
      laterAmount: c.laterAmount,
      laterDelay: c.laterDelay,
      laterMagnitude: c.magnitude,
      later,
    });
  });
  const stage2: FitChoice[] = [];
  participant.pairs.forEach((pair, i) => {
    for (const view of ['far', 'near'] as const) {
      const c = pair[view];
      const later = answered(c, `pairs[${i}].${view}`);
      if (later !== null) stage2.push(pairChoice(c, later));
    }
  });
  return { calibration, stage2 };
}

/** One view of a question pair as a FitChoice (sooner = small reward, later = large reward). */
export function pairChoice(c: ObservedChoice, later: boolean): FitChoice {
  return {
    soonerAmount: c.soonerAmount,
    soonerDelay: c.soonerDelay,
    soonerMagnitude: 'small',
    laterAmount: c.laterAmount,
    laterDelay: c.laterDelay,
    laterMagnitude: 'large',
    later,
  };
}

/** The pattern of a pair with both views answered, far view first; null when a view is unanswered. */
export function pairPattern(pair: ObservedPair): 'LL' | 'LS' | 'SL' | 'SS' | null {
  if (pair.far.choice === null || pair.near.choice === null) return null;
  return `${pair.far.choice === 'later' ? 'L' : 'S'}${pair.near.choice === 'later' ? 'L' : 'S'}` as 'LL' | 'LS' | 'SL' | 'SS';
}

function answered(c: ObservedChoice, field: string): boolean | null {
  if (c.choice === null || c.choice === undefined) return null;
  if (c.choice === 'later') return true;
  if (c.choice === 'sooner') return false;
  throw new DesignInputError(`${field}.choice`, "'sooner', 'later' or null", c.choice);
}
