import { checkChoiceModel, checkInteger, checkRatio, createRandom, discountAt, logChoiceProbability, priorPoints, probabilityLarger, type ChoiceModel, type RatePrior } from '@/lib/design';
import { RIVAL_MODELS } from './modelDiscrimination';

/** The probe pairs a design asks one participant: a soon delay and the late delays of its pairs (days). */
export type ProbePlacement = { soonDelay: number; lateDelays: readonly number[] } | null;

export type ModelRecoveryOptions = {
  ratio: number;
  /** the design's choice model (designChoiceModel) */
  choice: ChoiceModel;
  prior: RatePrior;
  /** where the design puts a participant's probe pairs, given their rates (taken as the estimates); null = no probes */
  place: (rates: { kSmall: number; kLarge: number }) => ProbePlacement;
  /** simulated participants per true model, 1 to 100,000 */
  participants: number;
  seed: number;
};

export type ModelRecovery = {
  participants: number;
  /** share of participants whose better-fitting model is the true one, with hyperbolic truth */
  hyperbolic: number;
  /** the same with exponential truth */
  exponential: number;
  /** mean of the two shares */
  overall: number;
  /** share of participants who got probe pairs at all */
  placed: number;
};

/**
 * Seeded simulation of how often a design's probes tell the hyperbolic and the exponential
 * model apart. Rates are drawn from the prior (Monte Carlo, the same draws for both truths:
 * common random numbers); each participant answers every probe pair's far view (SS at d vs LL
 * at D) and near view (SS now vs LL at D − d) by the design's logistic choice model under the
 * true model; the better-fitting model is the one with the higher likelihood of those answers at
 * the participant's rates (stage-1 estimates taken as exact). A tie, or a participant without
 * probe pairs, counts as one half (a coin flip between the models). See docs/mathematics.md,
 * "Model discrimination".
 *
 * @throws DesignInputError for a bad ratio, choice model, prior, participant count or seed
 * @example modelRecovery({ ratio: 0.5, choice: { sensitivity: 10 }, prior, place, participants: 300, seed: 1 }).overall // a share in [0, 1]
 */
export function modelRecovery(options: ModelRecoveryOptions): ModelRecovery {
  const { ratio: x, choice, prior, place } = options;
  checkRatio(x);
  checkChoiceModel(choice);
  checkInteger('participants', options.participants, 1, 100_000);
  const n = options.participants;
  const random = createRandom({ seed: options.seed });
  const points = priorPoints(prior, { method: 'monte-carlo', count: n, random });
  const gamma = choice.sensitivity;
  const lapse = choice.lapse ?? 0;
  const placements: ProbePlacement[] = [];
  let placed = 0;
  for (let i = 0; i < n; i++) {
    const p = place({ kSmall: points.kSmall[i], kLarge: points.kLarge[i] });
    placements.push(p && p.lateDelays.length > 0 ? p : null);
    if (placements[i]) placed++;
  }
  const shares: number[] = [];
  for (const truth of RIVAL_MODELS) {
    const rival = truth === 'hyperbolic' ? 'exponential' : 'hyperbolic';
    let recovered = 0;
    for (let i = 0; i < n; i++) {
      const p = placements[i];
      if (!p) {
        recovered += 0.5;
        continue;
      }
      const k = points.kSmall[i];
      const K = points.kLarge[i];
      const d = p.soonDelay;
      let margin = 0; // ln L(truth) − ln L(rival)
      for (const D of p.lateDelays) {
        for (const view of ['far', 'near'] as const) {
          const gap = (id: typeof truth) => (view === 'far' ? discountAt(id, K, 1, 1, D) - x * discountAt(id, k, 1, 1, d) : discountAt(id, K, 1, 1, D - d) - x);
          const later = random.uniform() < probabilityLarger(gamma, lapse, gap(truth));
          margin += logChoiceProbability(gamma, lapse, gap(truth), later) - logChoiceProbability(gamma, lapse, gap(rival), later);
        }
      }
      recovered += margin > 0 ? 1 : margin === 0 ? 0.5 : 0;
    }
    shares.push(recovered / n);
  }
  return { participants: n, hyperbolic: shares[0], exponential: shares[1], overall: 0.5 * (shares[0] + shares[1]), placed: placed / n };
}
