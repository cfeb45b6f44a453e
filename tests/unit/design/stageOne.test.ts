import { describe, expect, it } from 'vitest';
import { calibrationBlock, calibrationItems, describeCalibration, fitStageOne, probeReach, amountUnit, DesignInputError, pairDelays, optimiseLateDelay } from '@/lib/design';
import { jointSensitivityEstimate, PROFILE_SENSITIVITIES, SensitivityProfile } from '@/lib/design/power/sensitivityProfile';
import { frozenDesignSchema } from '@/lib/shared/validations/planner';
import { frozenDesign, POWER_PRIOR, powerDesign } from '../../support/frozen-design';
import reference from '../../fixtures/stage-one/stage-one.json';

type Case = (typeof reference.cases)[number];
const answers = (c: Case) => reference.items.map((item, i) => ({ magnitude: item.magnitude as 'small' | 'large', soonerAmount: item.soonerAmount, soonerDelay: 0, laterAmount: item.laterAmount, laterDelay: item.laterDelay, later: c.later[i] }));
const spanning = (fit: 'hyperboloid' | 'power-delay' | 'exponential-power') => frozenDesign({ calibration: { itemsPerMagnitude: 21, minDelay: 1, maxDelay: 1600, placement: 'span-probes', fit } });

describe('stage 1 with delay sensitivity: the maximum-likelihood fit of k, K and one s', () => {
  it('reaches the maximum scipy.optimize finds on the same simulated choices (docs/mathematics.md, "Stage 1 with delay sensitivity")', () => {
    // source: tests/fixtures/stage-one/generate.py — scipy.optimize.minimize (L-BFGS-B, 12 starts) on a likelihood written from the definitions
    for (const c of reference.cases) {
      const fit = fitStageOne(spanning(c.model as 'power-delay'), answers(c), { sensitivity: reference.gamma })!;
      expect(fit.model.id).toBe(c.model);
      // both maximise one function; L-BFGS-B stops within ~1e-9 of its optimum, so 1e-6 below it is a real miss
      expect(fit.logLikelihood).toBeGreaterThanOrEqual(c.logLikelihood - 1e-6);
      // where s is well determined (SE of ln s below 0.5, not at a bound) the two arguments agree on the log scale
      const se = fit.sensitivity.standardErrorLog;
      if (se !== null && se < 0.5 && !fit.sensitivity.atBound) expect(Math.abs(Math.log(fit.sensitivity.value / c.sensitivity))).toBeLessThan(1e-3);
    }
  });

  it('is null for a design that fits its own model with s fixed', () => {
    expect(fitStageOne(frozenDesign(), answers(reference.cases[0]), { sensitivity: 10 })).toBeNull();
  });

  it('the power simulation’s profile estimate comes within 0.01 of the maximum log-likelihood where s lies in its 0.3 to 1.3 range', () => {
    // measured worst case on the 13 fixtures it checks: 0.0033 (grid of 17 s and 49 ln k values refined by parabolas); 0.01 leaves 3× headroom and is a
    // small fraction of the 1.92 a 95 % likelihood-ratio interval for one parameter spans, so the profile's error is small beside sampling error
    const rows = (magnitude: string) => reference.items.filter((i) => i.magnitude === magnitude).map((i) => ({ soonerAmount: i.soonerAmount, soonerDelay: 0, laterAmount: i.laterAmount, laterDelay: i.laterDelay }));
    let checked = 0;
    for (const c of reference.cases) {
      if (!(c.sensitivity > PROFILE_SENSITIVITIES[0] && c.sensitivity < PROFILE_SENSITIVITIES[PROFILE_SENSITIVITIES.length - 1])) continue;
      if (c.kSmall < 1e-5 || c.kLarge < 1e-5) continue; // a rate at its bound: the grid's edge cell
      const bits = (magnitude: string) => reference.items.map((item, i) => [item, c.later[i]] as const).filter(([item]) => item.magnitude === magnitude).map(([, later]) => (later ? 1 : 0));
      const small = new SensitivityProfile(c.model as 'power-delay', rows('small'), reference.gamma, 0).profile(bits('small'));
      const large = new SensitivityProfile(c.model as 'power-delay', rows('large'), reference.gamma, 0).profile(bits('large'));
      const joint = jointSensitivityEstimate(small, large);
      const ll = logLikelihood(c, joint);
      expect(ll).toBeGreaterThan(c.logLikelihood - 0.01);
      checked++;
    }
    expect(checked).toBeGreaterThanOrEqual(8);
  });
});

function logLikelihood(c: Case, p: { kSmall: number; kLarge: number; sensitivity: number }): number {
  let total = 0;
  reference.items.forEach((item, i) => {
    const k = item.magnitude === 'small' ? p.kSmall : p.kLarge;
    const D = item.laterDelay;
    const f = c.model === 'hyperboloid' ? Math.pow(1 + k * D, -p.sensitivity) : c.model === 'power-delay' ? 1 / (1 + k * Math.pow(D, p.sensitivity)) : Math.exp(-k * Math.pow(D, p.sensitivity));
    const z = reference.gamma * (f - item.soonerAmount / item.laterAmount) * (c.later[i] ? 1 : -1);
    total += z >= 0 ? -Math.log1p(Math.exp(-z)) : z - Math.log1p(Math.exp(z));
  });
  return total;
}

describe('calibration delays that span the probes', () => {
  it('cycles the later delays through m log-spaced levels, each level offering 5 % to 95 % of the later amount', () => {
    const items = calibrationItems({ model: { id: 'hyperbolic' }, countPerMagnitude: 9, delayRange: { min: 1, max: 1000 }, delayLevels: 3, roundTo: 0, wholeDays: false });
    const small = items.filter((i) => i.magnitude === 'small');
    expect([...new Set(small.map((i) => i.laterDelay))].sort((a, b) => a - b)).toEqual([1, expect.closeTo(Math.sqrt(1000), 9), 1000]);
    for (const D of [1, 1000]) {
      const shares = small.filter((i) => Math.abs(i.laterDelay - D) < 1e-9).map((i) => i.soonerAmount / i.laterAmount);
      // hyperbolic tie rates 0.95 and 0.05 of the amount: (1/0.95 − 1)/D and 19/D, log-spaced, so the shares run 0.95 … 0.05 (1e-12: one division)
      expect(Math.max(...shares)).toBeCloseTo(0.95, 12);
      expect(Math.min(...shares)).toBeCloseTo(0.05, 12);
    }
  });

  it('raises the longest calibration delay to the probes’ reach over the prior and no lower than the set longest delay', () => {
    const design = powerDesign({ calibration: { itemsPerMagnitude: 20, minDelay: 1, maxDelay: 30, placement: 'span-probes' } });
    const reach = probeReach(design, { soonDelay: 30 })!;
    // the design point's own probes lie inside the reach
    const point = optimiseLateDelay({ model: design.spec.model, ratio: design.spec.ratio, soonDelay: 30, kSmall: POWER_PRIOR.medianSmall, kLarge: POWER_PRIOR.medianLarge })!;
    const probes = pairDelays(design, { soonDelay: 30, lateDelay: point.lateDelay }, { kSmall: POWER_PRIOR.medianSmall, kLarge: POWER_PRIOR.medianLarge })!.probes;
    expect(reach.longest).toBeGreaterThan(Math.max(...probes));
    const unit = amountUnit({ currency: 'EUR', largeAmount: 100, smallAmount: 82 });
    const block = calibrationBlock(design, { amountUnit: unit, delayUnit: 'days', coverDelay: 1, soonDelay: 30 });
    const delays = block.items.filter((i) => i.role === 'calibration').map((i) => i.laterDelay);
    expect(Math.max(...delays)).toBe(Math.ceil(reach.longest));
    expect(new Set(delays).size).toBe(3); // 20 items per magnitude: 3 levels
    const today = calibrationBlock(powerDesign({ calibration: { itemsPerMagnitude: 20, minDelay: 1, maxDelay: 30 } }), { amountUnit: unit, delayUnit: 'days', coverDelay: 1, soonDelay: 30 });
    expect(Math.max(...today.items.filter((i) => i.role === 'calibration').map((i) => i.laterDelay))).toBe(30);
  });

  it('says in words where the delays go and what stage 1 fits', () => {
    // the TSDoc example
    expect(describeCalibration({ calibration: { itemsPerMagnitude: 10, minDelay: 1, maxDelay: 365 } })).toBe(
      "later delays from 1 to 365 days (widened to the design point's pairs); stage 1 fits the design model with its delay sensitivity fixed",
    );
    expect(describeCalibration({ calibration: { itemsPerMagnitude: 10, minDelay: 1, maxDelay: 365, placement: 'span-probes', fit: 'power-delay' } })).toMatch(/in 3 log-spaced levels .* power-delay hyperbola \(Rachlin 2006\) by maximum likelihood/);
  });

  describe('bad input throws DesignInputError naming the field', () => {
    it.each([1, 11, 2.5])('bad input: delayLevels %j', (levels) => {
      expect(() => calibrationItems({ model: { id: 'hyperbolic' }, delayLevels: levels })).toThrow(expect.objectContaining({ field: 'delayLevels' }));
    });
    it('bad input: a negative soon delay for probeReach', () => {
      expect(() => probeReach(powerDesign(), { soonDelay: -1 })).toThrow(DesignInputError);
    });
  });

  describe('bad input: the design schema refuses s estimated without spanning delays, or on a population design', () => {
    it.each([
      [{ fit: 'power-delay' }, 'personalised'],
      [{ fit: 'hyperboloid', placement: 'span-probes' }, 'population'],
      [{ placement: 'everywhere' }, 'personalised'],
    ])('bad input: calibration %j in a %s design', (extra, mode) => {
      const content = frozenDesign();
      const parsed = frozenDesignSchema.safeParse({ ...content, spec: { ...content.spec, mode, calibration: { ...content.spec.calibration, ...extra } } });
      expect(parsed.success).toBe(false);
      expect(parsed.error!.issues[0].path.slice(0, 2)).toEqual(['spec', 'calibration']);
    });
  });
});
