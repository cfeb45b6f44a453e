import { probabilityLarger } from '../choiceProbability';
import { discountAt } from '../discountFactor';
import { DesignInputError } from '../DesignInputError';
import { estimateRates } from '../estimateRates';
import { calibrationBlock } from '../item-bank/calibrationBlock';
import { amountUnit } from '../item-bank/rounding';
import { probeSet, type ProbeSet } from '../power/probeSet';
import type { PowerDesign, PowerTruth } from '../power/types';
import { createRandom, type SeededRandom } from '../random';
import { priorPoints } from '../ratePrior';
import type { ModelSpec } from '../types';
import type { CalibrationChoice, ObservedChoice, ObservedPair, ParticipantData } from './types';

export type SimulatedParticipant = ParticipantData & {
  /** the true rates this participant chose by */
  truth: { kSmall: number; kLarge: number };
};

export type SimulationOptions = {
  design: PowerDesign;
  truth: PowerTruth;
  /** participants, 1 to 100,000 */
  participants: number;
  seed: number;
  /** share failing the attention check (answering it at random otherwise passes); default 0 */
  attentionFailureRate?: number;
  /** log-normal response times: median in ms and SD of ln; default none recorded */
  responseTimes?: { medianMs: number; sdLog: number };
  /** prefix of the participant ids; default 'P' */
  idPrefix?: string;
};

/**
 * Simulates a completed two-stage study from a known truth, as the power engine does
 * (createPowerSimulator), but keeping every choice: true rates from the truth's prior, the
 * design's calibration block (calibrationBlock, as exported) answered by the truth's model and
 * logistic choice, rates re-estimated under the design's model (estimateRates, γ = 10 as
 * serving uses), the probe block built at those estimates (probeSet) or the fallback set at
 * the prior medians, and both views of every pair answered by the truth. Used to check the
 * refit against a known truth and to make demo data.
 *
 * @throws DesignInputError for a bad count, seed or rate, or a design whose prior medians have no zone
 */
export function simulateStudy(options: SimulationOptions): SimulatedParticipant[] {
  const { design, truth } = options;
  const n = options.participants;
  if (!(Number.isInteger(n) && n >= 1 && n <= 100_000)) throw new DesignInputError('participants', 'a whole number from 1 to 100000', n);
  const attention = options.attentionFailureRate ?? 0;
  if (!(attention >= 0 && attention <= 1)) throw new DesignInputError('attentionFailureRate', 'a number from 0 to 1', attention);
  const random = createRandom({ seed: options.seed });
  const fallback = probeSet(design, design.prior.medianSmall, design.prior.medianLarge, design.designPoint);
  if (fallback === null) throw new DesignInputError('design.prior', 'a prior whose median rates have a reversal zone within the late-delay limit', design.prior);
  const spec = design.spec;
  const L = spec.largeAmount;
  const S = spec.ratio * L;
  const unit = amountUnit({ currency: spec.currency, largeAmount: L, smallAmount: S });
  const cover = Math.max(...fallback.probe, ...fallback.lateAnchor, ...fallback.soonAnchor);
  const block = calibrationBlock(design, { amountUnit: unit, delayUnit: 'days', coverDelay: cover, soonDelay: design.soonDelay }).items.filter((i) => i.role === 'calibration');
  const rates = priorPoints(truth.prior, { method: 'monte-carlo', count: n, random });
  const prefix = options.idPrefix ?? 'P';
  const out: SimulatedParticipant[] = [];
  for (let i = 0; i < n; i++) {
    const kTrue = rates.kSmall[i];
    const KTrue = rates.kLarge[i];
    const rt = () => (options.responseTimes ? Math.round(options.responseTimes.medianMs * Math.exp(options.responseTimes.sdLog * random.normal())) : null);
    const calibration: CalibrationChoice[] = block.map((item) => {
      const k = item.magnitude === 'small' ? kTrue : KTrue;
      const later = answer(truth, random, k, k, item);
      return { itemId: item.id, magnitude: item.magnitude!, soonerAmount: item.soonerAmount, soonerDelay: item.soonerDelay, laterAmount: item.laterAmount, laterDelay: item.laterDelay, choice: later ? 'later' : 'sooner', responseTimeMs: rt() };
    });
    const fit = estimateRates(
      calibration.map((c) => (c.choice === 'later' ? 'LL' : 'SS')),
      calibration.map((c) => ({ ...c, targetRate: Number.NaN })),
      spec.model,
    );
    const flags = [...fit.small.flags, ...fit.large.flags].filter((f) => f !== 'boundary');
    let probes: ProbeSet | null = null;
    let flag: string | null = flags[0] ?? null;
    if (spec.mode === 'personalised' && flag === null) {
      probes = probeSet(design, fit.small.rate, fit.large.rate);
      if (probes === null) flag = 'no-zone';
    }
    const set = probes ?? fallback;
    const d = probes === null && design.designPoint ? design.designPoint.soonDelay : design.soonDelay;
    const pairs: ObservedPair[] = [];
    const roles = [['late-anchor', set.lateAnchor], ['reversal-probe', set.probe], ['soon-anchor', set.soonAnchor]] as const;
    for (const [role, delays] of roles) {
      delays.forEach((D, j) => {
        const pairId = `${role}-${j + 1}`;
        const far = { itemId: `${pairId}-far`, soonerAmount: S, soonerDelay: d, laterAmount: L, laterDelay: D };
        const near = { itemId: `${pairId}-near`, soonerAmount: S, soonerDelay: 0, laterAmount: L, laterDelay: D - d };
        const view = (item: typeof far): ObservedChoice => ({ ...item, choice: answer(truth, random, kTrue, KTrue, item) ? 'later' : 'sooner', responseTimeMs: rt() });
        pairs.push({ pairId, role, far: view(far), near: view(near) });
      });
    }
    out.push({
      participantId: `${prefix}-${String(i + 1).padStart(4, '0')}`,
      calibration,
      pairs,
      attentionCheck: random.uniform() < attention ? 'failed' : 'passed',
      estimateFlag: spec.mode === 'personalised' ? flag : null,
      truth: { kSmall: kTrue, kLarge: KTrue },
    });
  }
  return out;
}

/** One simulated choice: true when the later option is chosen (logistic on the truth's value gap, in units of the later amount). */
function answer(truth: PowerTruth, random: SeededRandom, kSooner: number, kLater: number, item: { soonerAmount: number; soonerDelay: number; laterAmount: number; laterDelay: number }): boolean {
  const m: ModelSpec = truth.model;
  const s = m.sensitivity ?? 1;
  const beta = m.presentBias ?? 1;
  const gap = discountAt(m.id, kLater, s, beta, item.laterDelay) - (item.soonerAmount / item.laterAmount) * discountAt(m.id, kSooner, s, beta, item.soonerDelay);
  return random.uniform() < probabilityLarger(truth.gamma, truth.lapse, gap);
}
