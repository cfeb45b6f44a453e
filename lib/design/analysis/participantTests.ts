import { DesignInputError } from '../DesignInputError';
import { mcnemarExactTest, signTest } from '../power/binomialTest';
import { pairPattern } from './participantChoices';
import type { ParticipantData } from './types';

/** A sign test at the participant level. */
export type SignTestResult = {
  /** participants whose score is above 0 / below 0 / exactly 0 (ties are dropped) */
  positive: number;
  negative: number;
  ties: number;
  /** participants without the pairs the score needs */
  notScored: number;
  pValue: number;
};

export type ReversalTests = {
  alternative: 'two-sided' | 'greater';
  /** primary: per participant, LS minus SL count among answered reversal probes */
  signTest: SignTestResult;
  /** per participant, LS share among probes minus LS share among anchors (late and soon) */
  probesVsAnchors: SignTestResult;
  /** secondary: LS against SL pooled over every answered probe pair; assumes independent pairs, which a person's pairs are not */
  pooledMcNemar: { ls: number; sl: number; pValue: number; assumesIndependentPairs: true };
};

/**
 * Tests whether probes produced more reversals (LS) than reverse reversals (SL).
 *
 * Primary, at the participant level (a person's pairs are not independent): the exact sign
 * test (Conover 1999, Practical Nonparametric Statistics, §3.4) on each participant's
 * LS − SL count among reversal probes, and the same test on the within-person difference
 * between the LS share among probes and among anchors. Secondary: the exact McNemar test
 * (McNemar 1947) on LS against SL pooled over all probe pairs, which treats every pair as
 * independent. 'greater' tests more LS than SL (more LS among probes than anchors).
 * The same tests as the power simulation runs, so a planned power matches the analysis.
 *
 * @throws DesignInputError for an alternative other than 'two-sided' or 'greater'
 * @example reversalTests([], { alternative: 'greater' }).signTest.pValue // 1
 */
export function reversalTests(participants: readonly ParticipantData[], options: { alternative: 'two-sided' | 'greater' }): ReversalTests {
  const alternative = options?.alternative;
  if (alternative !== 'two-sided' && alternative !== 'greater') throw new DesignInputError('alternative', "'two-sided' or 'greater'", alternative);
  const sign = { positive: 0, negative: 0, ties: 0, notScored: 0 };
  const versus = { positive: 0, negative: 0, ties: 0, notScored: 0 };
  let ls = 0;
  let sl = 0;
  for (const participant of participants) {
    let probes = 0;
    let probeLS = 0;
    let probeSL = 0;
    let anchors = 0;
    let anchorLS = 0;
    for (const pair of participant.pairs) {
      const pattern = pairPattern(pair);
      if (pattern === null) continue;
      if (pair.role === 'reversal-probe') {
        probes++;
        if (pattern === 'LS') probeLS++;
        if (pattern === 'SL') probeSL++;
      } else {
        anchors++;
        if (pattern === 'LS') anchorLS++;
      }
    }
    ls += probeLS;
    sl += probeSL;
    if (probes === 0) sign.notScored++;
    else score(sign, probeLS - probeSL);
    if (probes === 0 || anchors === 0) versus.notScored++;
    else score(versus, probeLS / probes - anchorLS / anchors);
  }
  return {
    alternative,
    signTest: { ...sign, pValue: signTest(sign.positive, sign.negative, alternative).pValue },
    probesVsAnchors: { ...versus, pValue: signTest(versus.positive, versus.negative, alternative).pValue },
    pooledMcNemar: { ls, sl, pValue: mcnemarExactTest(ls, sl, alternative).pValue, assumesIndependentPairs: true },
  };
}

function score(tally: { positive: number; negative: number; ties: number }, value: number): void {
  if (value > 0) tally.positive++;
  else if (value < 0) tally.negative++;
  else tally.ties++;
}
