import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { createRandom, predictPattern, serveParticipant, type BankItem } from '@/lib/design';
import { bankFor } from '@/lib/shared/item-bank-plan';
import { frozenDesign as design, HASH } from '../support/frozen-design';
import jstat from 'jstat';

const { jStat } = jstat as unknown as { jStat: { binomial: { cdf: (k: number, n: number, p: number) => number } } };

// A fine calibration block (40 items per magnitude: neighbouring tie rates ~13 % apart) so a
// noiseless chooser's rates are pinned down well enough to land probes inside the true zone.
const content = design({ calibration: { itemsPerMagnitude: 40, minDelay: 1, maxDelay: 180 }, probePairs: 2, lateAnchors: 2, soonAnchors: 2 });
const { bank, locate } = bankFor({ hash: HASH, content });
const calibration = bank.items.filter((i) => i.role === 'calibration');

/** Hyperbolic value difference later − sooner, in units of the later amount (Mazur 1987). */
function gap(item: BankItem, rates: { kSmall: number; kLarge: number }) {
  const k = item.magnitude === 'small' ? rates.kSmall : rates.kLarge;
  return (item.laterAmount / (1 + k * item.laterDelay) - item.soonerAmount) / item.laterAmount;
}

function answers(rates: { kSmall: number; kLarge: number }, noise?: { gamma: number; seed: number }) {
  const random = noise ? createRandom({ seed: noise.seed }) : null;
  return Object.fromEntries(
    calibration.map((item) => {
      const g = gap(item, rates);
      const later = random ? random.uniform() < 1 / (1 + Math.exp(-noise!.gamma * g)) : g > 0;
      return [item.id, later ? 'later' : 'sooner'];
    }),
  );
}

function patternOf(items: BankItem[], pairId: string, rates: { kSmall: number; kLarge: number }) {
  const far = items.find((i) => i.id === `${pairId}-far`)!;
  return predictPattern({ model: { id: 'hyperbolic' }, ratio: far.soonerAmount / far.laterAmount, soonDelay: far.soonerDelay, lateDelay: far.laterDelay, ...rates });
}

/** The central band [low, high] holding all but `outside` of Binomial(n, p), by jstat's CDF. */
function binomialBand(n: number, p: number, outside: number): [number, number] {
  let low = 0;
  while (jStat.binomial.cdf(low, n, p) <= outside / 2) low++;
  let high = n;
  while (high > 0 && jStat.binomial.cdf(high - 1, n, p) >= 1 - outside / 2) high--;
  return [low, high];
}

// Participants whose zone is wide compared with the calibration's resolution: for the hyperbolic
// model (U − d)/(L − d) = 1 + d(k − xK)/(1 − x) (from the closed-form bounds in docs/mathematics.md, "Closed forms"), so
// a zone log-width W is reached with k = xK + (1 − x)(e^W − 1)/d. W from 1 to 1.6, kLarge from
// 0.004 to 0.012 per day: both rates stay inside the calibration's rate range.
const participant = fc
  .record({ lnK: fc.double({ min: Math.log(0.004), max: Math.log(0.012), noNaN: true }), width: fc.double({ min: 1, max: 1.6, noNaN: true }) })
  .map(({ lnK, width }) => ({ kLarge: Math.exp(lnK), kSmall: 0.6 * Math.exp(lnK) + (0.4 * Math.expm1(width)) / 14 }));

describe('personalised probe blocks for simulated participants', () => {
  it('noiseless choosers get probes showing LS and anchors showing LL and SS under their true rates', () => {
    fc.assert(
      fc.property(participant, (truth) => {
        const served = serveParticipant(content, bank, { participantId: 'sim', responses: answers(truth), locate });
        expect(served.flag).toBeNull();
        expect(served.itemSet).toBe('personal');
        const pairIds = [...new Set(served.items.map((i) => i.pairId).filter((p): p is string => p !== null))];
        for (const pairId of pairIds) {
          const expected = pairId.startsWith('probe') ? 'LS' : pairId.startsWith('late') ? 'LL' : 'SS';
          expect(patternOf(served.items, pairId, truth), `${pairId} for ${JSON.stringify(truth)}`).toBe(expected);
        }
      }),
      { numRuns: 150 },
    );
  });

  it('with choice noise, reports the estimation error (standard errors and intervals) instead of hiding it', () => {
    // Logistic choice with γ = 10 (docs/mathematics.md, "Choice model"). If the Wald 95 % interval
    // has its nominal coverage, the count of covered rates among n independent estimates is
    // Binomial(n, 0.95); accept the central 99.9 % band of that distribution (jstat's binomial CDF,
    // docs/mathematics.md, "Acceptance bands for simulated coverage"). The seed is fixed, so the
    // outcome is repeatable: 165 of 174 are covered (94.8 %).
    let covered = 0;
    let total = 0;
    fc.assert(
      fc.property(participant, fc.integer({ min: 0, max: 2 ** 31 }), (truth, seed) => {
        const served = serveParticipant(content, bank, { participantId: `noisy-${seed}`, responses: answers(truth, { gamma: 10, seed }), locate });
        for (const [estimate, rate] of [[served.estimates.kSmall, truth.kSmall], [served.estimates.kLarge, truth.kLarge]] as const) {
          if (estimate.flags.length) continue;
          expect(estimate.standardErrorLog).toBeGreaterThan(0);
          expect(estimate.interval!.lower).toBeLessThan(estimate.rate);
          expect(estimate.interval!.upper).toBeGreaterThan(estimate.rate);
          total++;
          if (estimate.interval!.lower <= rate && rate <= estimate.interval!.upper) covered++;
        }
      }),
      { numRuns: 100, seed: 20261202 },
    );
    expect(total).toBeGreaterThan(150);
    const [low, high] = binomialBand(total, 0.95, 0.001);
    expect(covered).toBeGreaterThanOrEqual(low);
    expect(covered).toBeLessThanOrEqual(high);
  });

  it('all-sooner, all-later and inconsistent answers get the documented fallback set and the flag', () => {
    const ids = calibration.map((i) => i.id);
    const cases = {
      'all-sooner': Object.fromEntries(ids.map((id) => [id, 'sooner'])),
      'all-later': Object.fromEntries(ids.map((id) => [id, 'later'])),
      'non-monotone': Object.fromEntries(ids.map((id, n) => [id, n % 2 ? 'sooner' : 'later'])),
    };
    for (const [flag, responses] of Object.entries(cases)) {
      const served = serveParticipant(content, bank, { participantId: flag, responses, locate });
      expect(served.flag).toBe(flag);
      expect(served.itemSet).toBe('fallback');
      const fallbackIds = bank.items.filter((i) => i.block === 'probe').map((i) => `${i.id}:${i.laterDelay}`).sort();
      expect(served.items.map((i) => `${i.id}:${i.laterDelay}`).sort()).toEqual(fallbackIds);
    }
  });
});
