import { describe, expect, it } from 'vitest';
import { buildItemBank, ItemBankInputError, nextCalibrationItem, serveParticipant, type BankItem } from '@/lib/design';
import { locateFor } from '@/lib/shared/item-bank-plan';
import { designFormSchema, toForm, toSpec } from '@/lib/shared/planner/design-form-values';
import { frozenDesign } from '@/tests/support/frozen-design';

// The item bank of a design with adaptive calibration: its candidate set, the next-item step (deterministic
// per participant and answers) and stage 2 served from the posterior (docs/mathematics.md, "Adaptive calibration").
const design = frozenDesign({ calibration: { itemsPerMagnitude: 10, minDelay: 1, maxDelay: 180, adaptive: { maxItems: 6, targetSd: 0 } } });
const bank = buildItemBank(design, { seed: 7, locate: locateFor(design) });

/** A noise-free hyperbolic chooser. */
const answerOf = (item: BankItem, k = 0.05, K = 0.01) => (item.laterAmount / (1 + (item.magnitude === 'small' ? k : K) * item.laterDelay) > item.soonerAmount ? 'later' : 'sooner');

describe('a bank with adaptive calibration', () => {
  it('lists 500 or more distinct candidates, worded, and keeps the fixed block and the probe block as without it', () => {
    expect(bank.adaptive).not.toBeNull();
    const candidates = bank.adaptive!.candidates;
    expect(candidates.length).toBeGreaterThanOrEqual(500);
    expect(new Set(candidates.map((c) => c.id)).size).toBe(candidates.length);
    expect(candidates.every((c) => c.text.startsWith('Which would you take') && c.block === 'calibration')).toBe(true);
    const fixed = buildItemBank(frozenDesign({ calibration: { itemsPerMagnitude: 10, minDelay: 1, maxDelay: 180 } }), { seed: 7, locate: locateFor(design) });
    expect(fixed.adaptive).toBeNull();
    expect(bank.items).toEqual(fixed.items);
    expect(bank.notes.some((n) => n.startsWith('Calibration is adaptive'))).toBe(true);
  });

  it('rounds candidate delays to the delay unit and drops the ones that then coincide', () => {
    const weeks = buildItemBank(design, { seed: 7, delayUnit: 'weeks', locate: locateFor(design) });
    expect(weeks.adaptive!.candidates.every((c) => c.laterDelay % 7 === 0)).toBe(true);
    expect(weeks.adaptive!.candidates.length).toBeLessThan(bank.adaptive!.candidates.length);
  });

  it('asks the same items of the same participant and answers, other items of another, and stops at maxItems', () => {
    const run = (participantId: string) => {
      const answers: { itemId: string; chosen: 'sooner' | 'later' }[] = [];
      let step = nextCalibrationItem(design, bank, { participantId, answers });
      while (!step.done) {
        answers.push({ itemId: step.item!.id, chosen: answerOf(step.item!) });
        step = nextCalibrationItem(design, bank, { participantId, answers });
      }
      return step;
    };
    const a = run('P-1');
    expect(a).toMatchObject({ answered: 6, done: true, reason: 'max-items', item: null });
    expect(run('P-1')).toEqual(a);
    expect(Object.keys(a.responses)).toHaveLength(6);
  });

  it('serves stage 2 at the posterior medians once calibration is over, and refuses it before', () => {
    const answers: { itemId: string; chosen: 'sooner' | 'later' }[] = [];
    let step = nextCalibrationItem(design, bank, { participantId: 'P-2', answers });
    while (!step.done) {
      answers.push({ itemId: step.item!.id, chosen: answerOf(step.item!) });
      step = nextCalibrationItem(design, bank, { participantId: 'P-2', answers });
      if (answers.length === 3) {
        expect(() => serveParticipant(design, bank, { participantId: 'P-2', responses: step.responses, locate: locateFor(design) })).toThrow(ItemBankInputError);
      }
    }
    const served = serveParticipant(design, bank, { participantId: 'P-2', responses: step.responses, locate: locateFor(design) });
    expect(served.estimates.kSmall.rate).toBeCloseTo(step.estimates.kSmall.rate, 14);
    expect(served.estimates.kLarge.standardErrorLog).toBeCloseTo(step.estimates.kLarge.standardErrorLog, 14);
    expect(served.items.length).toBeGreaterThan(0);
    // the posterior does not depend on the order of the answers (up to the rounding of sums in another order: 1e-12)
    const reversed = Object.fromEntries(Object.entries(step.responses).reverse());
    const again = serveParticipant(design, bank, { participantId: 'P-2', responses: reversed, locate: locateFor(design) }).estimates;
    for (const rate of ['kSmall', 'kLarge'] as const) {
      expect(again[rate].rate).toBeCloseTo(served.estimates[rate].rate, 12);
      expect(again[rate].standardErrorLog!).toBeCloseTo(served.estimates[rate].standardErrorLog!, 12);
    }
  });

  it('refuses answers naming an unknown item, a repeated item or a bad choice, each by its field', () => {
    const first = nextCalibrationItem(design, bank, { participantId: 'P-3', answers: [] }).item!;
    const issues = (answers: { itemId: string; chosen: string }[]) => {
      try {
        nextCalibrationItem(design, bank, { participantId: 'P-3', answers: answers as never });
        return [];
      } catch (error) {
        return (error as ItemBankInputError).issues.map((i) => i.path);
      }
    };
    expect(issues([{ itemId: 'cal-small-01', chosen: 'later' }])).toEqual(['answers.0.itemId']);
    expect(issues([{ itemId: first.id, chosen: 'later' }, { itemId: first.id, chosen: 'later' }])).toEqual(['answers.1.itemId']);
    expect(issues([{ itemId: first.id, chosen: 'maybe' }])).toEqual(['answers.0.chosen']);
    const fixed = frozenDesign();
    expect(() => nextCalibrationItem(fixed, buildItemBank(fixed, { seed: 1, locate: locateFor(fixed) }), { participantId: 'P', answers: [] })).toThrow(ItemBankInputError);
  });
});

describe('the design form’s adaptive calibration option', () => {
  it('round-trips through the form: off keeps the spec without it, on keeps its stop rule', () => {
    const off = frozenDesign().spec;
    expect(toSpec(toForm(off)).calibration).toEqual(off.calibration);
    expect(toForm(off).calibration.adaptive.enabled).toBe(false);
    const on = design.spec;
    expect(toSpec(toForm(on)).calibration.adaptive).toEqual({ maxItems: 6, targetSd: 0 });
  });

  it('names the field of a stop rule out of range', () => {
    const values = toForm(design.spec);
    const result = designFormSchema.safeParse({ ...values, calibration: { ...values.calibration, adaptive: { enabled: true, maxItems: 1, targetSd: 3 } } });
    expect(result.success).toBe(false);
    const paths = result.error!.issues.map((i) => i.path.join('.'));
    expect(paths).toEqual(expect.arrayContaining(['calibration.adaptive.maxItems', 'calibration.adaptive.targetSd']));
  });
});
