// The session page with adaptive calibration (issue 17): the page asks the items the session API's
// next-item step would ask (one choice, one seed, one stop rule), then serves stage 2 at the posterior.
import { describe, expect, it } from 'vitest';
import { nextCalibrationItem as apiStep, serveParticipant, type BankItem } from '@/lib/design';
import { bankFor } from '@/lib/shared/item-bank-plan';
import { contentHash } from '@/lib/shared/canonical-json';
import { nextCalibrationItem } from '@/lib/server/services/session-page/calibration-step';
import { currentStep, type PageItems } from '@/lib/server/services/session-page/steps';
import { frozenDesign } from '../../support/frozen-design';

const content = frozenDesign({ calibration: { itemsPerMagnitude: 10, minDelay: 1, maxDelay: 180, adaptive: { maxItems: 5, targetSd: 0 } } });
const { bank, locate } = bankFor({ hash: contentHash(content), content });
const items: PageItems = { calibration: bank.adaptive!.candidates, adaptive: { design: content, bank }, probeLength: 6, currency: 'EUR', delayUnit: 'days' };
const link = { completionCode: 'DONE-1', redirectUrl: null, participantParam: 'pid' };
const answerOf = (item: BankItem) => (item.laterAmount / (1 + (item.magnitude === 'small' ? 0.04 : 0.01) * item.laterDelay) > item.soonerAmount ? 'later' : 'sooner');

describe('the session page with adaptive calibration', () => {
  it('asks the items the next-item step chooses, up to the stop rule, then stage 2 at the posterior medians', () => {
    const answers: Record<string, 'sooner' | 'later'> = {};
    const progress = { consented: true, instructionsRead: true, calibration: answers, served: null as BankItem[] | null, stage2: new Map<string, 'sooner' | 'later'>() };
    for (let n = 0; n < 5; n++) {
      const next = nextCalibrationItem(items, answers, 'P7')!;
      const step = apiStep(content, bank, { participantId: 'P7', answers: Object.entries(answers).map(([itemId, chosen]) => ({ itemId, chosen })) });
      expect(next.id).toBe(step.item!.id);
      expect(currentStep(link, 'P7', items, progress)).toMatchObject({ kind: 'choice', number: n + 1, total: 5 + 6, choice: { itemId: next.id, block: 'calibration' } });
      answers[next.id] = answerOf(next);
    }
    expect(nextCalibrationItem(items, answers, 'P7')).toBeNull();
    const served = serveParticipant(content, bank, { participantId: 'P7', responses: answers, locate });
    const done = apiStep(content, bank, { participantId: 'P7', answers: Object.entries(answers).map(([itemId, chosen]) => ({ itemId, chosen })) });
    expect(served.estimates.kSmall.rate).toBeCloseTo(done.estimates.kSmall.rate, 14);
    progress.served = served.items;
    expect(currentStep(link, 'P7', items, progress)).toMatchObject({ kind: 'choice', number: 6, total: 5 + served.items.length, choice: { block: 'probe' } });
  });

  it('asks a participant the same first item on every visit', () => {
    const a = nextCalibrationItem(items, {}, 'P1')!;
    expect(nextCalibrationItem(items, {}, 'P1')!.id).toBe(a.id);
  });
});
