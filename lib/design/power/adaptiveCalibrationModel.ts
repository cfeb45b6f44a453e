import { AdaptiveCalibration } from '../adaptive/adaptiveCalibration';
import { adaptiveCandidates, adaptiveGrid, DEFAULT_ADAPTIVE_STOP } from '../adaptive/designAdaptive';
import { probabilityLarger } from '../choiceProbability';
import { designChoiceModel } from '../designChoiceModel';
import { discountAt } from '../discountFactor';
import type { SeededRandom } from '../random';
import type { CalibrationEstimate } from './calibrationModel';
import type { PowerScenario } from './types';

/**
 * The simulated adaptive calibration of a scenario (docs/mathematics.md, "Adaptive calibration"):
 * the design's candidate set (calibration range widened to the design point's probes, as the item
 * bank builds it), its grid and the design's one choice model; each simulated participant answers
 * the items adaptive design optimisation picks, from the truth (its model, γ, ε, delay sensitivity
 * and present bias), until the design's stop rule (`calibration.adaptive`, else 12 items or a
 * posterior SD of 0.3) ends it. The rates handed on are the posterior medians; such estimates are
 * never flagged (the prior keeps them interior), so no participant falls back for calibration.
 * The tie-break seed is drawn from the replicate's generator, keeping runs reproducible.
 */
export class AdaptiveCalibrationModel {
  readonly longestDelay: number;
  private readonly engine: AdaptiveCalibration;
  private readonly stop: { maxItems: number; targetSd: number };

  constructor(
    private readonly scenario: PowerScenario,
    coverDelay: number,
  ) {
    const { design } = scenario;
    const candidates = adaptiveCandidates(design, { coverDelay });
    this.engine = new AdaptiveCalibration({ grid: adaptiveGrid(design), candidates, choice: designChoiceModel(design.spec) });
    this.longestDelay = Math.max(...candidates.map((c) => c.laterDelay));
    this.stop = design.spec.calibration.adaptive ?? DEFAULT_ADAPTIVE_STOP;
  }

  /** Simulates one participant's adaptive calibration from their true rates and delay sensitivity s; estimates for the small and the large reward. */
  answerBoth(kTrue: number, KTrue: number, s: number, random: SeededRandom): [CalibrationEstimate, CalibrationEstimate] {
    const { truth } = this.scenario;
    const beta = truth.model.presentBias ?? 1;
    const bias = truth.presentBias ?? 1; // every later delay here is > 0
    const engine = this.engine;
    engine.reset();
    const seed = Math.floor(random.uniform() * 2147483647);
    for (let n = 0; n < this.stop.maxItems; n++) {
      if (n > 0 && this.stop.targetSd > 0) {
        const summary = engine.summary();
        if (summary.small.sd <= this.stop.targetSd && summary.large.sd <= this.stop.targetSd) break;
      }
      const next = engine.choose({ seed });
      if (next === null) break;
      const c = next.candidate;
      const rate = c.magnitude === 'small' ? kTrue : KTrue;
      const gap = bias * discountAt(truth.model.id, rate, s, beta, c.laterDelay) - c.soonerAmount / c.laterAmount;
      engine.answer({ index: next.index, choice: random.uniform() < probabilityLarger(truth.gamma, truth.lapse, gap) ? 'LL' : 'SS' });
    }
    const summary = engine.summary();
    return [
      { rate: Math.exp(summary.small.median), flagged: false, fallback: false },
      { rate: Math.exp(summary.large.median), flagged: false, fallback: false },
    ];
  }
}
