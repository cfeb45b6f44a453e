// serveParticipant keeps the fits of calibration answers it has seen, per item bank: a repeated
// answer pattern must give exactly what a fresh fit gives, for the design it is served under.
import { describe, expect, it } from 'vitest';
import { estimateRates, serveParticipant, type Choice } from '@/lib/design';
import { bankFor } from '@/lib/shared/item-bank-plan';
import { contentHash } from '@/lib/shared/canonical-json';
import { frozenDesign } from '../../support/frozen-design';

const content = frozenDesign();
const { bank, locate } = bankFor({ hash: contentHash(content), content });
const calibration = bank.items.filter((i) => i.role === 'calibration');

/** A consistent chooser: sooner on each magnitude's first `switchAt` items in bank order, later after. */
function answersOf(switchAt: number): Record<string, 'sooner' | 'later'> {
  const seen = { small: 0, large: 0 };
  return Object.fromEntries(calibration.map((i) => [i.id, ++seen[i.magnitude!] <= switchAt ? 'sooner' : 'later']));
}

/** The fit a fresh call of estimateRates gives for these answers under `design`. */
function freshFit(design: typeof content, answers: Record<string, 'sooner' | 'later'>) {
  const choices: Choice[] = calibration.map((i) => (answers[i.id] === 'later' ? 'LL' : 'SS'));
  const items = calibration.map((i) => ({ magnitude: i.magnitude!, soonerAmount: i.soonerAmount, soonerDelay: i.soonerDelay, laterAmount: i.laterAmount, laterDelay: i.laterDelay, targetRate: Number.NaN }));
  return estimateRates(choices, items, design.spec.model, { sensitivity: design.spec.choiceSensitivity ?? 10, lapse: 0 });
}

describe('fits of repeated calibration answers', () => {
  it('serve a second participant with the same answers exactly what a fresh fit gives, in objects of their own', () => {
    const answers = answersOf(4);
    const first = serveParticipant(content, bank, { participantId: 'P-1', responses: answers, locate });
    const second = serveParticipant(content, bank, { participantId: 'P-2', responses: answers, locate });
    const fresh = freshFit(content, answers);
    for (const served of [first, second]) {
      expect(served.estimates.kSmall).toEqual({ rate: fresh.small.rate, standardErrorLog: fresh.small.standardErrorLog, interval: fresh.small.interval, flags: fresh.small.flags });
      expect(served.estimates.kLarge.rate).toBe(fresh.large.rate);
    }
    expect(second.estimates.kSmall.flags).not.toBe(first.estimates.kSmall.flags);
    expect(serveParticipant(content, bank, { participantId: 'P-3', responses: answersOf(7), locate }).estimates.kSmall.rate).toBe(freshFit(content, answersOf(7)).small.rate);
  });

  it('fit the same answers again under a design with another choice sensitivity served from the same bank', () => {
    const answers = answersOf(5);
    const sharper = { ...content, spec: { ...content.spec, choiceSensitivity: (content.spec.choiceSensitivity ?? 10) * 3 } };
    const usual = serveParticipant(content, bank, { participantId: 'P-4', responses: answers, locate }).estimates.kSmall;
    const other = serveParticipant(sharper, bank, { participantId: 'P-4', responses: answers, locate }).estimates.kSmall;
    expect(other.rate).toBe(freshFit(sharper, answers).small.rate);
    expect(other.standardErrorLog).not.toBe(usual.standardErrorLog);
  });
});
