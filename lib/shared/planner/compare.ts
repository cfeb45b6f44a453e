import { MODEL_IDS, optimiseLateDelay, pairDelaysAround, type ModelId, type ModelSpec } from '@/lib/design';
import { expectedReversalRate, modelRecovery, type ModelRecovery, type ProbePlacement } from '@/lib/criteria';
import { discriminationProbe, fallbackProbe } from './choose-delays';
import { personalDelays, sharesAt } from './personal';
import { expectationNodes } from './points';
import { modelOf } from './summary';
import type { DesignSummary, PlannerInput } from './types';

/** Delay sensitivity and present bias assumed for the other models in the robustness rows, unless the design sets them. */
export const ROBUSTNESS_DEFAULTS = { sensitivity: 0.8, presentBias: 0.9 };

/** The model `id` with the design's own s or β where it has one, else the robustness defaults. */
export function alternativeModel(id: ModelId, own: ModelSpec): ModelSpec {
  if (id === 'hyperboloid' || id === 'power-delay' || id === 'exponential-power') return { id, sensitivity: own.sensitivity ?? ROBUSTNESS_DEFAULTS.sensitivity };
  if (id === 'quasi-hyperbolic') return { id, presentBias: own.presentBias ?? ROBUSTNESS_DEFAULTS.presentBias };
  return { id };
}

/**
 * Robustness: the expected reversal rate of the design's probe pairs when people's choices
 * follow each model (the design's own first), with the delays the design chose under its
 * assumed model. Population designs keep their one late delay; personalised designs keep each
 * participant's delay, set from their rates under the assumed model.
 */
export function robustness(input: PlannerInput, summary: DesignSummary): Array<{ model: ModelSpec; own: boolean; rate: number }> {
  const own = modelOf(input.spec);
  const nodes = expectationNodes(input.prior, summary.choiceSensitivity);
  const d = summary.soonDelay;
  const gamma = summary.choiceSensitivity;
  const probe = summary.roles.find((r) => r.role === 'probe')?.lateDelay ?? null;
  const ids = [own.id, ...MODEL_IDS.filter((id) => id !== own.id)];
  const delays =
    input.spec.mode === 'personalised' && probe !== null && d > 0
      ? personalDelays(own, input.spec.ratio, d, input.spec.lateDelayLimit, nodes, {
          probe: fallbackProbe({ model: own, ratio: input.spec.ratio, limit: input.spec.lateDelayLimit, gamma, prior: input.prior, nodes }, d),
          late: NaN,
          soon: NaN,
        }).probe
      : null;
  return ids.map((id) => {
    const model = id === own.id ? own : alternativeModel(id, own);
    let rate = 0;
    if (probe !== null && probe > d) {
      rate = delays
        ? (sharesAt(model, input.spec.ratio, d, nodes, delays, gamma)?.LS ?? 0)
        : expectedReversalRate({ model, ratio: input.spec.ratio, soonDelay: d, lateDelay: probe, choice: { sensitivity: gamma }, points: nodes });
    }
    return { model, own: id === own.id, rate };
  });
}

/** Simulated participants per true model behind the "models told apart" row (a thousand: a few milliseconds in the browser as fields change; standard error of a share about 0.014). */
export const TOLD_APART_PARTICIPANTS = 1000;
/** Fixed seed of that simulation, so every design is judged on the same participants and the figure is reproducible. */
export const TOLD_APART_SEED = 17017;

/**
 * How well a design's probe pairs tell the hyperbolic and the exponential model apart
 * (modelRecovery): simulated share of participants whose better-fitting model is the true one,
 * both models as truths, TOLD_APART_PARTICIPANTS per truth with TOLD_APART_SEED. Each participant
 * gets the probes the item bank would serve at their rates (stage-1 estimates taken as exact):
 * personalised designs at their own late delay (gap product or model discrimination, at the
 * design's soon delay), participants without a zone the fallback set at the prior medians;
 * population designs everybody the shared set.
 */
export function modelsToldApart(input: PlannerInput, summary: DesignSummary): ModelRecovery | null {
  const { spec, prior } = input;
  const d = summary.soonDelay;
  const main = summary.roles[1].lateDelay;
  if (!(d > 0) || main === null || !(main > d)) return null;
  const model = modelOf(spec);
  const design = { spec: { ...spec, model } };
  const medians = { kSmall: prior.medianSmall, kLarge: prior.medianLarge };
  const shared = pairDelaysAround(design, { soonDelay: d, lateDelay: main }, medians);
  const sharedSet: ProbePlacement = shared ? { soonDelay: d, lateDelays: shared.probes } : null;
  const gamma = summary.choiceSensitivity;
  const s = { model, ratio: spec.ratio, limit: spec.lateDelayLimit, gamma, reversalWeight: spec.reversalWeight };
  const place = (rates: { kSmall: number; kLarge: number }): ProbePlacement => {
    if (spec.mode === 'population') return sharedSet;
    const pair = { model, ratio: spec.ratio, soonDelay: d, ...rates };
    const optimum = optimiseLateDelay(pair);
    if (!optimum) return sharedSet;
    const lateDelay = spec.criterion === 'model-discrimination' ? discriminationProbe(s, d, rates.kSmall, rates.kLarge) : Math.min(spec.lateDelayLimit, optimum.lateDelay);
    const delays = pairDelaysAround(design, { soonDelay: d, lateDelay }, rates, optimum);
    return delays ? { soonDelay: d, lateDelays: delays.probes } : sharedSet;
  };
  return modelRecovery({ ratio: spec.ratio, choice: { sensitivity: gamma }, prior, place, participants: TOLD_APART_PARTICIPANTS, seed: TOLD_APART_SEED });
}

export type CompareRow = {
  key: string;
  label: string;
  unit: string;
  values: Array<number | null>;
  better: 'higher' | 'lower' | 'none';
  best: number[];
  /** a sentence that says how to read the row, where its values are not self-explanatory */
  note?: string;
};

/** Indices of the best value in a row (ties all win); none when fewer than two values exist. */
export function bestOf(values: Array<number | null>, better: CompareRow['better']): number[] {
  if (better === 'none') return [];
  const present = values.map((v, i) => [v, i] as const).filter((p): p is readonly [number, number] => p[0] !== null && Number.isFinite(p[0]));
  if (present.length < 2) return [];
  const target = better === 'higher' ? Math.max(...present.map((p) => p[0])) : Math.min(...present.map((p) => p[0]));
  return present.filter((p) => Math.abs(p[0] - target) <= 1e-12 * Math.max(1, Math.abs(target))).map((p) => p[1]);
}

/** The comparison table's numeric rows for summaries side by side (one column per design). */
export function compareRows(inputs: PlannerInput[], summaries: DesignSummary[]): CompareRow[] {
  const robust = inputs.map((input, i) => robustness(input, summaries[i]));
  const row = (key: string, label: string, unit: string, values: Array<number | null>, better: CompareRow['better']): CompareRow => ({ key, label, unit, values, better, best: bestOf(values, better) });
  const zoneWidth = summaries.map((s) => (s.typical.zone && Number.isFinite(s.typical.zone.upper) ? s.typical.zone.upper - s.typical.zone.lower : null));
  const rows: CompareRow[] = [
    row('zone-width', 'Zone width, typical participant', 'days', zoneWidth, 'higher'),
    row('soon-delay', 'Soon delay d', 'days', summaries.map((s) => s.soonDelay), 'none'),
    row('probe-delay', 'Probe late delay D', 'days', summaries.map((s) => s.roles[1].lateDelay), 'none'),
    row('late-anchor', 'Late-anchor delay', 'days', summaries.map((s) => s.roles[0].lateDelay), 'none'),
    row('soon-anchor', 'Soon-anchor delay', 'days', summaries.map((s) => s.roles[2].lateDelay), 'none'),
    row('gap-product', 'Gap product at the optimum, typical participant', '× L²', summaries.map((s) => s.typical.optimum?.gapProduct ?? null), 'higher'),
    row('criterion', 'Criterion value (comparable only between designs with the same criterion)', '', summaries.map((s) => s.criterionValue), new Set(summaries.map((s) => s.criterion)).size === 1 ? 'higher' : 'none'),
    row('reversal-own', 'Expected reversal rate, own model', 'share of probes', summaries.map((s) => s.expectedReversalRate), 'higher'),
  ];
  for (const id of MODEL_IDS) {
    rows.push(row(`reversal-${id}`, `Expected reversal rate if choices follow ${id}`, 'share of probes', robust.map((r) => r.find((x) => x.model.id === id)?.rate ?? null), 'higher'));
  }
  rows.push(row('worst-model', 'Worst expected reversal rate over the models', 'share of probes', robust.map((r) => Math.min(...r.map((x) => x.rate))), 'higher'));
  // Anchors are placed where their clarity equals the probe's gap product, so their raw clarities
  // repeat the gap-product row by construction; what differs between designs is whether the
  // distance bound stopped an anchor short of that target, which the share shows.
  const anchorShare = (anchor: 'lateAnchor' | 'soonAnchor') =>
    summaries.map((s) => {
      const target = s.typical.optimum?.gapProduct;
      const clarity = s.typical[anchor]?.clarity;
      return target && clarity !== undefined && target > 0 ? clarity / target : null;
    });
  const anchorNote = 'Anchors sit where their clarity (the product of their two gaps) equals the probe’s gap product, so this is 100% unless the distance bound (4 × the zone’s distance from d) stopped the anchor first.';
  rows.push({ ...row('late-clarity', 'Late-anchor clarity, as a share of the probe’s gap product', 'share of the target', anchorShare('lateAnchor'), 'higher'), note: anchorNote });
  rows.push({ ...row('soon-clarity', 'Soon-anchor clarity, as a share of the probe’s gap product', 'share of the target', anchorShare('soonAnchor'), 'higher'), note: anchorNote });
  const toldApart = inputs.map((input, i) => modelsToldApart(input, summaries[i]));
  const toldNote = `Simulated: ${TOLD_APART_PARTICIPANTS} participants drawn from the prior per true model (hyperbolic, then exponential; seed ${TOLD_APART_SEED}), answering the design's probe pairs with its choice sensitivity γ; counted when the model whose likelihood of their answers is higher is the true one (ties half). Estimates from simulated choices, not a judgement of anyone.`;
  rows.push({ ...row('models-told-apart', 'Models told apart (hyperbolic vs exponential)', 'share of participants', toldApart.map((r) => r?.overall ?? null), 'higher'), note: toldNote });
  rows.push({ ...row('told-apart-hyperbolic', 'Models told apart, hyperbolic truth', 'share of participants', toldApart.map((r) => r?.hyperbolic ?? null), 'higher'), note: toldNote });
  rows.push({ ...row('told-apart-exponential', 'Models told apart, exponential truth', 'share of participants', toldApart.map((r) => r?.exponential ?? null), 'higher'), note: toldNote });
  rows.push(row('reversible', 'Share of the prior that can reverse', 'share', summaries.map((s) => s.reversibleShare), 'higher'));
  return rows;
}
