// The session page's step order (consent, instructions, the calibration block, the served stage-2
// block with no break, completion), how options are put on their sides, and the completion
// redirect carrying the participant id.
import { describe, expect, it } from 'vitest';
import { amountText, delayText, serveParticipant } from '@/lib/design';
import { bankFor } from '@/lib/shared/item-bank-plan';
import { contentHash } from '@/lib/shared/canonical-json';
import { completionFor } from '@/lib/server/services/session-page/completion';
import { nextCalibrationItem } from '@/lib/server/services/session-page/calibration-step';
import { choiceOf, currentStep, type PageItems } from '@/lib/server/services/session-page/steps';
import { frozenDesign } from '../../support/frozen-design';

const content = frozenDesign();
const version = { hash: contentHash(content), content };
const { bank, locate } = bankFor(version);
const calibration = bank.items.filter((i) => i.block === 'calibration').sort((a, b) => a.position - b.position);
const items: PageItems = { calibration, adaptive: null, probeLength: bank.items.filter((i) => i.block === 'probe').length, currency: 'EUR', delayUnit: 'days' };
const link = { completionCode: 'DONE-1', redirectUrl: 'https://panel.example.org/back?wave=2', participantParam: 'pid' };
const start = { consented: false, instructionsRead: false, calibration: {}, served: null, stage2: new Map<string, 'sooner' | 'later'>() };

describe('the session page steps', () => {
  it('asks for consent, then shows the instructions, then the first calibration item', () => {
    expect(currentStep(link, 'P1', items, start)).toEqual({ kind: 'consent' });
    expect(currentStep(link, 'P1', items, { ...start, consented: true })).toEqual({ kind: 'instructions' });
    const step = currentStep(link, 'P1', items, { ...start, consented: true, instructionsRead: true });
    expect(step).toMatchObject({ kind: 'choice', number: 1, total: calibration.length + items.probeLength, choice: { itemId: calibration[0]!.id, block: 'calibration' } });
  });

  it('runs the calibration block in the bank order, attention check included, then the served block with no break, then completes', () => {
    const answers: Record<string, 'sooner' | 'later'> = {};
    const order: string[] = [];
    for (let next = nextCalibrationItem(items, answers, 'P1'); next; next = nextCalibrationItem(items, answers, 'P1')) {
      order.push(next.id);
      answers[next.id] = next.id === 'check-calibration' ? 'sooner' : 'later';
    }
    expect(order).toEqual(calibration.map((i) => i.id));
    expect(order).toContain('check-calibration');
    const served = serveParticipant(content, bank, { participantId: 'P1', responses: answers, locate }).items;
    const progress = { consented: true, instructionsRead: true, calibration: answers, served, stage2: new Map<string, 'sooner' | 'later'>() };
    const first = currentStep(link, 'P1', items, progress);
    expect(first).toMatchObject({ kind: 'choice', number: calibration.length + 1, total: calibration.length + served.length, choice: { itemId: served[0]!.id, block: 'probe' } });
    for (const item of served) progress.stage2.set(item.id, 'later');
    expect(currentStep(link, 'P1', items, progress)).toEqual({ kind: 'complete', completion: { code: 'DONE-1', redirectUrl: 'https://panel.example.org/back?wave=2&pid=P1' } });
  });

  it('refuses to guess a step when the calibration block is complete but nothing was served', () => {
    const answers = Object.fromEntries(calibration.map((i) => [i.id, 'later' as const]));
    expect(() => currentStep(link, 'P1', items, { ...start, consented: true, instructionsRead: true, calibration: answers })).toThrow(/serve the stage-2 items/);
  });

  it('puts each option on the side the bank chose, worded as the item bank words it', () => {
    for (const item of bank.items) {
      const choice = choiceOf(item, items);
      const sooner = choice.options.find((o) => o.option === 'sooner')!;
      expect(sooner.side).toBe(item.soonerSide);
      expect(choice.options[0].side).toBe('left');
      expect(sooner.amount).toBe(amountText(item.soonerAmount, 'EUR'));
      expect(sooner.when).toBe(delayText(item.soonerDelay, 'days'));
      expect(choice.options.find((o) => o.option === 'later')!.when).toBe(delayText(item.laterDelay, 'days'));
    }
  });
});

describe('the completion step', () => {
  it('adds the participant id to the redirect in the link\'s parameter, encoded, replacing one already there', () => {
    expect(completionFor({ ...link, redirectUrl: 'https://panel.example.org/done' }, 'a@b:c').redirectUrl).toBe('https://panel.example.org/done?pid=a%40b%3Ac');
    expect(completionFor({ ...link, redirectUrl: 'https://panel.example.org/done?pid=old&x=1', participantParam: 'pid' }, 'P2').redirectUrl).toBe('https://panel.example.org/done?pid=P2&x=1');
    expect(completionFor({ ...link, redirectUrl: null }, 'P3')).toEqual({ code: 'DONE-1', redirectUrl: null });
  });
});
