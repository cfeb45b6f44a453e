import { anchorDelays, extrapolationWarning, optimiseLateDelay, reversalZone, reversibleShare, type ModelSpec, type RatePoints } from '@/lib/design';
import { expectedRateNodes } from '@/lib/criteria';
import { gapCurve, valueCurve } from './curves';
import { discriminationProbe, fallbackProbe, personalCriterion, personalSoonDelay, populationDelays, type Setting } from './choose-delays';
import { personalDelays, sharesAt } from './personal';
import { expectationNodes, priorDraws, quantileSorted } from './points';
import { designChoiceModel } from '@/lib/design/designChoiceModel';
import { type DesignSummary, type PlannerInput, type PlannerWarning, type RoleSummary } from './types';

/** The model as the core wants it: s only for the models that have it, β only for quasi-hyperbolic. */
export function modelOf(spec: PlannerInput['spec']): ModelSpec {
  const { id, sensitivity, presentBias } = spec.model;
  if (id === 'hyperboloid' || id === 'power-delay' || id === 'exponential-power') return { id, sensitivity: sensitivity ?? 1 };
  if (id === 'quasi-hyperbolic') return { id, presentBias: presentBias ?? 1 };
  return { id };
}

/**
 * Every number the design page shows, from the design's settings and its prior — the same
 * function runs in the browser (live, as fields change) and on the server (the summary route).
 * Expectations use the prior's Gauss–Hermite nodes, as many as keep an expected reversal rate
 * within 1e-4 absolute at the design's γ (expectationNodes); the spread of zone bounds uses 2,000
 * seeded draws. Personalised designs assume the calibration block recovers each participant's
 * rates exactly (the power simulation drops that assumption).
 *
 * @param options.draws, options.nodes precomputed prior points (the browser keeps them while only design fields change)
 * @throws DesignInputError (from the core) when a value is out of the core's range
 */
export function computeDesignSummary(input: PlannerInput, options: { draws?: RatePoints; nodes?: RatePoints } = {}): DesignSummary {
  const { spec, prior } = input;
  const model = modelOf(spec);
  const gamma = designChoiceModel(spec).sensitivity;
  const nodes = options.nodes ?? expectationNodes(prior, gamma);
  const draws = options.draws ?? priorDraws(prior);
  const s: Setting = { model, ratio: spec.ratio, limit: spec.lateDelayLimit, gamma, prior, nodes, reversalWeight: spec.reversalWeight };
  const typicalRates = { kSmall: prior.medianSmall, kLarge: prior.medianLarge };

  const population = spec.mode === 'population' ? populationDelays(spec, s) : null;
  const d = population ? population.soonDelay : personalSoonDelay(spec, s);
  const pair = { model, ratio: spec.ratio, soonDelay: d, ...typicalRates };
  const zone = d > 0 ? reversalZone(pair) : null;
  const optimum = d > 0 ? optimiseLateDelay(pair) : null;
  const anchors = d > 0 ? anchorDelays(pair) : null;
  const lateAnchor = anchors?.late ? { lateDelay: anchors.late.lateDelay, clarity: anchors.late.clarity, reachesTarget: anchors.late.reachesTarget } : null;
  const soonAnchor = anchors?.soon ? { lateDelay: anchors.soon.lateDelay, clarity: anchors.soon.clarity, reachesTarget: anchors.soon.reachesTarget } : null;

  let roles: RoleSummary[];
  let criterionValue: number | null;
  let probeDelays: number[];
  if (population) {
    const late = lateAnchor && lateAnchor.lateDelay < population.lateDelay ? lateAnchor.lateDelay : null;
    const soon = soonAnchor && soonAnchor.lateDelay > population.lateDelay && soonAnchor.lateDelay <= spec.lateDelayLimit ? soonAnchor.lateDelay : null;
    const everyone = (D: number | null) => (D === null ? null : sharesAt(model, spec.ratio, d, nodes, new Float64Array(nodes.kSmall.length).fill(D), gamma));
    roles = [
      { role: 'late-anchor', count: spec.lateAnchors, lateDelay: late, shares: everyone(late) },
      { role: 'probe', count: spec.probePairs, lateDelay: population.lateDelay, shares: everyone(population.lateDelay) },
      { role: 'soon-anchor', count: spec.soonAnchors, lateDelay: soon, shares: everyone(soon) },
    ];
    criterionValue = population.value;
    probeDelays = [population.lateDelay, ...(soon ? [soon] : [])];
  } else {
    const fallback = fallbackProbe(s, d);
    const discriminating = spec.criterion === 'model-discrimination';
    const probeAt = discriminating ? (kSmall: number, kLarge: number) => discriminationProbe(s, d, kSmall, kLarge) : undefined;
    const delays = personalDelays(model, spec.ratio, d, spec.lateDelayLimit, nodes, { probe: fallback, late: NaN, soon: NaN }, probeAt);
    const typicalProbe = optimum ? Math.min(spec.lateDelayLimit, probeAt ? probeAt(typicalRates.kSmall, typicalRates.kLarge) : optimum.lateDelay) : fallback;
    roles = [
      { role: 'late-anchor', count: spec.lateAnchors, lateDelay: lateAnchor ? Math.min(spec.lateDelayLimit, lateAnchor.lateDelay) : null, shares: sharesAt(model, spec.ratio, d, nodes, delays.late, gamma) },
      { role: 'probe', count: spec.probePairs, lateDelay: typicalProbe, shares: sharesAt(model, spec.ratio, d, nodes, delays.probe, gamma) },
      { role: 'soon-anchor', count: spec.soonAnchors, lateDelay: soonAnchor && soonAnchor.lateDelay <= spec.lateDelayLimit ? soonAnchor.lateDelay : null, shares: sharesAt(model, spec.ratio, d, nodes, delays.soon, gamma) },
    ];
    criterionValue = spec.criterion === 'expected-reversal-rate' ? (roles[1].shares?.LS ?? 0) : personalCriterion(spec.criterion, s, d, fallback);
    probeDelays = [typicalProbe, ...(roles[2].lateDelay ? [roles[2].lateDelay] : [])];
  }
  const probeShares = roles[1].shares;
  const boundSpread = spreadOfBounds(model, spec.ratio, d, spec.lateDelayLimit, draws);
  const probeDelay = roles[1].lateDelay;

  return {
    mode: spec.mode,
    criterion: spec.criterion,
    model,
    choiceSensitivity: gamma,
    soonDelay: d,
    typical: { ...typicalRates, zone, optimum: optimum ? { lateDelay: optimum.lateDelay, gapProduct: optimum.gapProduct } : null, lateAnchor, soonAnchor },
    criterionValue,
    expectedReversalRate: probeShares?.LS ?? 0,
    reversibleShare: reversibleShare(prior, { model, ratio: spec.ratio, soonDelay: d }),
    boundSpread,
    roles,
    valueCurve: probeDelay && probeDelay > d ? valueCurve({ model, ratio: spec.ratio, largeAmount: spec.largeAmount, soonDelay: d, lateDelay: probeDelay, ...typicalRates }) : null,
    gapCurve: gapCurve({ model, ratio: spec.ratio, soonDelay: d, ...typicalRates, limit: spec.lateDelayLimit, zone, optimum }),
    warnings: [
      ...warningsFor(spec, d, zone, optimum, boundSpread, probeDelays, lateAnchor, soonAnchor),
      ...accuracyWarning(gamma, prior),
    ],
  };
}

/** A warning when γ × the prior's spread is beyond what the largest quadrature rule keeps within 1e-4. */
function accuracyWarning(gamma: number, prior: PlannerInput['prior']): PlannerWarning[] {
  const { sharpness, withinTarget } = expectedRateNodes({ choice: { sensitivity: gamma }, prior });
  if (withinTarget) return [];
  return [{
    kind: 'accuracy',
    message: `With choice sensitivity ${gamma} and a prior spread of ${Math.max(prior.sdLogSmall, prior.sdLogLarge)} (γ × spread = ${Math.round(sharpness)}), expected reversal rates are computed on the largest quadrature rule and may be off by more than 0.0001; compare designs rather than read the rates to four decimals.`,
  }];
}

function spreadOfBounds(model: ModelSpec, ratio: number, d: number, limit: number, draws: RatePoints): DesignSummary['boundSpread'] {
  if (!(d > 0)) return null;
  const n = draws.kSmall.length;
  const lower: number[] = [];
  const upper: number[] = [];
  let beyond = 0;
  for (let i = 0; i < n; i++) {
    const z = reversalZone({ model, ratio, soonDelay: d, kSmall: draws.kSmall[i], kLarge: draws.kLarge[i] });
    if (!z) continue;
    lower.push(z.lower);
    upper.push(z.upper);
    if (z.lower >= limit) beyond++;
  }
  if (!lower.length) return { draws: n, withZone: 0, lower: null, upper: null, beyondLimit: 0 };
  lower.sort((a, b) => a - b);
  upper.sort((a, b) => a - b);
  const q = (v: number[]) => ({ p10: quantileSorted(v, 0.1), p50: quantileSorted(v, 0.5), p90: quantileSorted(v, 0.9) });
  return { draws: n, withZone: lower.length, lower: q(lower), upper: q(upper), beyondLimit: beyond };
}

function warningsFor(
  spec: PlannerInput['spec'],
  d: number,
  zone: { lower: number; upper: number } | null,
  optimum: { lateDelay: number } | null,
  spread: DesignSummary['boundSpread'],
  probeDelays: number[],
  lateAnchor: { reachesTarget: boolean } | null,
  soonAnchor: { reachesTarget: boolean; lateDelay: number } | null,
): PlannerWarning[] {
  const out: PlannerWarning[] = [];
  if (d === 0) out.push({ kind: 'empty-zone', message: 'With a soon delay of 0 days the far and near views are the same question, so no reversal can be observed. Choose a soon delay of at least 1 day.' });
  else if (!zone) out.push({ kind: 'empty-zone', message: 'The typical participant (the prior’s median rates) has no reversal zone under this model, ratio and soon delay: their small-reward rate is not far enough above the large-reward rate.' });
  if (optimum && optimum.lateDelay > spec.lateDelayLimit) out.push({ kind: 'limit', message: `The typical participant’s best late delay (${Math.round(optimum.lateDelay)} days) is beyond the late-delay limit (${spec.lateDelayLimit} days); their probe is cut to the limit.` });
  if (spread && spread.withZone > 0 && spread.beyondLimit / spread.draws >= 0.05) out.push({ kind: 'limit', message: `For ${Math.round((100 * spread.beyondLimit) / spread.draws)}% of the prior the zone starts beyond the late-delay limit; those participants cannot meet a probe inside their zone.` });
  if ((lateAnchor && !lateAnchor.reachesTarget) || (soonAnchor && !soonAnchor.reachesTarget)) out.push({ kind: 'no-room', message: 'An anchor for the typical participant stops at its distance bound before it is as clear-cut as the probe.' });
  const probes = probeDelays.filter((v) => v > 0 && Number.isFinite(v));
  if (probes.length) {
    const w = extrapolationWarning({ calibrationDelays: [spec.calibration.minDelay, spec.calibration.maxDelay], probeDelays: probes });
    if (w) out.push({ kind: 'extrapolation', message: w.message });
  }
  return out;
}
