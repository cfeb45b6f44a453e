import type { BankItem, CalibrationChoice, ObservedPair, ParticipantData } from '@/lib/design';

/** A stored stage-2 answer as the analysis reads it. */
export type StoredAnswer = { chosen: 'SS' | 'LL' | string; responseMs: number | null };

/**
 * One served participant as the analysis core reads them: the bank's calibration items with the
 * participant's calibration answers, the served pairs (both views) with the stage-2 answers on
 * record (null where none), the attention check and the serving flag.
 */
export function participantData(input: {
  participantId: string;
  calibrationItems: readonly BankItem[];
  responses: Record<string, string>;
  served: { items?: BankItem[]; flag?: string | null; attentionCheck?: ParticipantData['attentionCheck'] };
  answers: ReadonlyMap<string, StoredAnswer>;
}): ParticipantData {
  const calibration: CalibrationChoice[] = input.calibrationItems
    .filter((i) => i.role === 'calibration')
    .map((i) => {
      const value = input.responses[i.id];
      return { itemId: i.id, magnitude: i.magnitude!, soonerAmount: i.soonerAmount, soonerDelay: i.soonerDelay, laterAmount: i.laterAmount, laterDelay: i.laterDelay, choice: value === 'later' || value === 'sooner' ? value : null };
    });
  const pairs = new Map<string, Partial<ObservedPair>>();
  for (const item of input.served.items ?? []) {
    if (!item.pairId || !item.view || (item.role !== 'reversal-probe' && item.role !== 'late-anchor' && item.role !== 'soon-anchor')) continue;
    const answer = input.answers.get(item.id);
    const pair = pairs.get(item.pairId) ?? { pairId: item.pairId, role: item.role };
    pair[item.view] = {
      itemId: item.id,
      soonerAmount: item.soonerAmount,
      soonerDelay: item.soonerDelay,
      laterAmount: item.laterAmount,
      laterDelay: item.laterDelay,
      choice: answer ? (answer.chosen === 'LL' ? 'later' : 'sooner') : null,
      responseTimeMs: answer?.responseMs ?? null,
    };
    pairs.set(item.pairId, pair);
  }
  return {
    participantId: input.participantId,
    calibration,
    pairs: [...pairs.values()].filter((q): q is ObservedPair => q.far !== undefined && q.near !== undefined),
    attentionCheck: input.served.attentionCheck ?? 'not-answered',
    estimateFlag: input.served.flag ?? null,
  };
}
