import { optimisePopulationDesign, priorScenarios, type PopulationCriterion } from '@/lib/criteria';
import { buildItemBank, designChoiceModel, optimiseLateDelay, priorPoints, reversalZone, type DelayUnit, type ItemBank, type LocatePoint } from '@/lib/design';
import type { FrozenDesign } from '@/lib/shared/validations/planner';

/**
 * Where a design puts its probe pairs for given rates.
 * - personalised, fixed soon delay d: the late delay maximising the gap product at the rates (optimiseLateDelay);
 * - personalised, optimised soon delay: optimisePopulationDesign with the gap product at the rates;
 * - population: one point for everybody, from optimisePopulationDesign with the design's criterion
 *   over the prior (expected reversal rate on quadrature points, maximin gap over prior scenarios,
 *   or the gap product at the medians); computed once;
 * - model discrimination (either mode): the delays maximising the hyperbolic-vs-exponential divergence
 *   plus the weighted reversal term (modelDiscrimination) at the rates: the participant's estimates,
 *   or the prior medians for a population design.
 */
export function locateFor(design: FrozenDesign): LocatePoint {
  const { spec, prior } = design;
  const soon = spec.soonDelay.mode === 'fixed' ? { min: spec.soonDelay.days, max: spec.soonDelay.days } : { min: spec.soonDelay.min, max: spec.soonDelay.max };
  const common = { model: spec.model, ratio: spec.ratio, soonDelay: soon, lateDelayMax: spec.lateDelayLimit };
  if (spec.criterion === 'model-discrimination') {
    const discriminate = discriminationLocator(design);
    if (spec.mode === 'personalised') return discriminate;
    const at = discriminate({ kSmall: prior.medianSmall, kLarge: prior.medianLarge });
    return () => at;
  }
  if (spec.mode === 'population') {
    let cached: ReturnType<LocatePoint> | undefined;
    return () => {
      if (cached !== undefined) return cached;
      const criterion: PopulationCriterion =
        spec.criterion === 'expected-reversal-rate'
          ? { kind: 'expected-reversal-rate', choice: designChoiceModel(spec), points: priorPoints(prior, { method: 'quadrature' }) }
          : spec.criterion === 'maximin'
            ? { kind: 'maximin-gap', scenarios: priorScenarios(prior) }
            : { kind: 'gap-product', kSmall: prior.medianSmall, kLarge: prior.medianLarge };
      const best = optimisePopulationDesign({ ...common, criterion });
      cached = best.value > 0 ? { soonDelay: best.soonDelay, lateDelay: best.lateDelay } : null;
      return cached;
    };
  }
  if (spec.soonDelay.mode === 'fixed') {
    const d = spec.soonDelay.days;
    return (rates) => {
      const optimum = optimiseLateDelay({ model: spec.model, ratio: spec.ratio, soonDelay: d, ...rates });
      return optimum ? { soonDelay: d, lateDelay: optimum.lateDelay } : null;
    };
  }
  return (rates) => {
    const best = optimisePopulationDesign({ ...common, criterion: { kind: 'gap-product', ...rates }, grid: { soon: 8, late: 16 }, refinementRounds: 3 });
    return best.value > 0 ? { soonDelay: best.soonDelay, lateDelay: best.lateDelay } : null;
  };
}

/**
 * Where a model-discrimination design puts its probe pairs for given rates: optimisePopulationDesign
 * with the 'model-discrimination' criterion at those rates (soon delay free within the design's
 * bounds when it is optimised). Null when the rates have no reversal zone at that soon delay, so the
 * participant gets the fallback set like every other personalised design.
 */
export function discriminationLocator(design: FrozenDesign): LocatePoint {
  const { spec } = design;
  const soon = spec.soonDelay.mode === 'fixed' ? { min: spec.soonDelay.days, max: spec.soonDelay.days } : { min: spec.soonDelay.min, max: spec.soonDelay.max };
  const choice = designChoiceModel(spec);
  const reversalWeight = spec.reversalWeight ?? 0;
  return (rates) => {
    const best = optimisePopulationDesign({
      model: spec.model,
      ratio: spec.ratio,
      criterion: { kind: 'model-discrimination', ...rates, choice, reversalWeight },
      soonDelay: soon,
      lateDelayMax: spec.lateDelayLimit,
      grid: { soon: soon.max > soon.min ? 8 : 1, late: 24 },
      refinementRounds: 3,
    });
    if (!reversalZone({ model: spec.model, ratio: spec.ratio, soonDelay: best.soonDelay, ...rates })) return null;
    return { soonDelay: best.soonDelay, lateDelay: best.lateDelay };
  };
}

/** The default seed of a version's bank: the first 32 bits of its content hash, so the default export is reproducible. */
export function defaultSeed(hash: string): number {
  return parseInt(hash.slice(0, 8), 16);
}

type Entry = { bank: ItemBank; locate: LocatePoint };
const cache = new Map<string, Entry>();
const CACHE_LIMIT = 64;

/**
 * The item bank of a frozen version, built once per process for each (hash, seed, unit, gap):
 * frozen content never changes, so the cache never goes stale.
 */
export function bankFor(version: { hash: string; content: FrozenDesign }, options: { seed?: number; delayUnit?: DelayUnit; minGap?: number } = {}): Entry {
  const seed = options.seed ?? defaultSeed(version.hash);
  const key = `${version.hash}:${seed}:${options.delayUnit ?? 'days'}:${options.minGap ?? 2}`;
  const hit = cache.get(key);
  if (hit) return hit;
  const locate = locateFor(version.content);
  const bank = buildItemBank(version.content, { seed, delayUnit: options.delayUnit, minGap: options.minGap, locate });
  if (cache.size >= CACHE_LIMIT) cache.delete(cache.keys().next().value!);
  const entry = { bank, locate };
  cache.set(key, entry);
  return entry;
}
