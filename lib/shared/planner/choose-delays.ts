import { discriminationLateDelay, maximiseBrent, optimiseLateDelay, type ModelSpec, type RatePoints } from '@/lib/design';
import { maximinGap, modelDiscrimination, optimisePopulationDesign, priorScenarios, type PopulationCriterion } from '@/lib/criteria';
import type { DesignSpec, PriorValues } from '@/lib/shared/validations/planner';
import { personalDelays, sharesAt } from './personal';
import { priorNodes } from './points';

export type Setting = { model: ModelSpec; ratio: number; limit: number; gamma: number; prior: PriorValues; nodes: RatePoints; /** model discrimination's reversal weight */ reversalWeight?: number };

/** The population criterion object of the core's optimiser for a design's criterion. */
export function populationCriterion(criterion: DesignSpec['criterion'], s: Setting): PopulationCriterion {
  if (criterion === 'expected-reversal-rate') return { kind: 'expected-reversal-rate', choice: { sensitivity: s.gamma }, points: s.nodes };
  if (criterion === 'maximin') return { kind: 'maximin-gap', scenarios: priorScenarios(s.prior) };
  if (criterion === 'model-discrimination') return { kind: 'model-discrimination', kSmall: s.prior.medianSmall, kLarge: s.prior.medianLarge, choice: { sensitivity: s.gamma }, reversalWeight: s.reversalWeight ?? 0 };
  return { kind: 'gap-product', kSmall: s.prior.medianSmall, kLarge: s.prior.medianLarge };
}

/**
 * Population design: the soon and late delays maximising the criterion over the whole prior
 * (optimisePopulationDesign). An optimised soon delay is rounded to whole days and the late
 * delay re-optimised for it, so what is shown is what would be asked.
 */
export function populationDelays(spec: Pick<DesignSpec, 'soonDelay' | 'criterion'>, s: Setting) {
  const criterion = populationCriterion(spec.criterion, s);
  const base = { model: s.model, ratio: s.ratio, criterion, lateDelayMax: s.limit };
  let d = spec.soonDelay.mode === 'fixed' ? spec.soonDelay.days : NaN;
  if (spec.soonDelay.mode === 'optimised') {
    const wide = optimisePopulationDesign({ ...base, soonDelay: { min: spec.soonDelay.min, max: spec.soonDelay.max }, grid: { soon: 8, late: 24 }, refinementRounds: 2 });
    d = Math.round(wide.soonDelay);
  }
  const fixed = optimisePopulationDesign({ ...base, soonDelay: { min: d, max: d }, grid: { soon: 1, late: 32 } });
  return { soonDelay: d, lateDelay: fixed.lateDelay, value: fixed.value };
}

/**
 * A personalised design's criterion at soon delay d, each participant (point) at their own
 * optimal late delay: the typical participant's gap product, the expected reversal rate over
 * the prior, the smallest gap over the prior's scenarios, or the typical participant's model
 * discrimination (divergence plus weighted reversal term).
 */
export function personalCriterion(criterion: DesignSpec['criterion'], s: Setting, d: number, fallbackProbe: number): number {
  if (!(d > 0)) return 0;
  if (criterion === 'model-discrimination') {
    const D = discriminationProbe(s, d, s.prior.medianSmall, s.prior.medianLarge);
    return discriminationValue(s, d, D, s.prior.medianSmall, s.prior.medianLarge);
  }
  if (criterion === 'gap-product') return optimiseLateDelay({ model: s.model, ratio: s.ratio, soonDelay: d, kSmall: s.prior.medianSmall, kLarge: s.prior.medianLarge })?.gapProduct ?? 0;
  if (criterion === 'maximin') {
    let worst = Infinity;
    for (const sc of priorScenarios(s.prior)) {
      const opt = optimiseLateDelay({ model: s.model, ratio: s.ratio, soonDelay: d, ...sc });
      const D = opt ? Math.min(s.limit, opt.lateDelay) : fallbackProbe;
      worst = Math.min(worst, D > d ? maximinGap({ model: s.model, ratio: s.ratio, soonDelay: d, lateDelay: D, scenarios: [sc] }) : -Infinity);
    }
    return worst;
  }
  const fallback = { probe: fallbackProbe, late: NaN, soon: NaN };
  const delays = personalDelays(s.model, s.ratio, d, s.limit, s.nodes, fallback);
  return sharesAt(s.model, s.ratio, d, s.nodes, delays.probe, s.gamma)?.LS ?? 0;
}

/** The model-discrimination criterion's value at one pair and rate pair. */
export function discriminationValue(s: Setting, d: number, D: number, kSmall: number, kLarge: number): number {
  return modelDiscrimination({ model: s.model, ratio: s.ratio, soonDelay: d, lateDelay: D, kSmall, kLarge, choice: { sensitivity: s.gamma }, reversalWeight: s.reversalWeight ?? 0 }).value;
}

/** A model-discrimination design's probe late delay for given rates at soon delay d (the divergence plus weighted reversal term, maximised). */
export function discriminationProbe(s: Pick<Setting, 'model' | 'ratio' | 'limit' | 'gamma' | 'reversalWeight'>, d: number, kSmall: number, kLarge: number): number {
  return discriminationLateDelay(s.model, s.ratio, d, kSmall, kLarge, s.gamma, 0, s.reversalWeight ?? 0, s.limit);
}

/** The fallback late delay for participants without a zone: the population optimum of the expected reversal rate at d. */
export function fallbackProbe(s: Setting, d: number): number {
  if (!(s.limit > d + 1)) return s.limit;
  const choice = { sensitivity: s.gamma };
  return optimisePopulationDesign({ model: s.model, ratio: s.ratio, criterion: { kind: 'expected-reversal-rate', choice, points: s.nodes }, soonDelay: { min: d, max: d }, lateDelayMax: s.limit, grid: { soon: 1, late: 24 }, refinementRounds: 2 }).lateDelay;
}

/** Soon delay for a personalised design: fixed, or the whole day within bounds maximising personalCriterion (coarse nodes while searching). */
export function personalSoonDelay(spec: Pick<DesignSpec, 'soonDelay' | 'criterion'>, s: Setting): number {
  if (spec.soonDelay.mode === 'fixed') return spec.soonDelay.days;
  const { min, max } = spec.soonDelay;
  const lo = Math.max(min, 1);
  const hi = Math.min(max, s.limit - 1);
  if (!(hi > lo)) return Math.max(min, Math.min(max, lo));
  const coarse: Setting = { ...s, nodes: priorNodes(s.prior, 6) };
  const f = (u: number) => {
    const d = Math.expm1(u);
    return personalCriterion(spec.criterion, coarse, d, fallbackProbe(coarse, d));
  };
  const best = maximiseBrent(f, { lower: Math.log1p(lo), upper: Math.log1p(hi), tolerance: 1e-3 });
  const candidates = [Math.floor(Math.expm1(best.argmax)), Math.ceil(Math.expm1(best.argmax)), lo, hi].filter((d) => d >= lo && d <= hi);
  let pick = candidates[0];
  let value = -Infinity;
  for (const d of candidates) {
    const v = f(Math.log1p(d));
    if (v > value) [pick, value] = [d, v];
  }
  return pick;
}
