import { checkChoiceModel, logChoiceProbability, probabilityLarger, type ChoiceModel } from '../choiceProbability';
import { discountAt } from '../discountFactor';
import { DesignInputError } from '../DesignInputError';
import { createRandom } from '../random';
import type { AdaptiveCandidate } from './calibrationCandidates';
import { summariseMarginal, type LogSummary, type RateGrid } from './ratePosterior';

/** A calibration answer: the candidate's index in the set and the option chosen. */
export type AdaptiveAnswer = { index: number; choice: 'SS' | 'LL' };

/** The next item to ask and its expected information gain, nats. */
export type AdaptiveChoice = { index: number; candidate: AdaptiveCandidate; information: number };

/** Posterior summaries of ln k, ln K and (models with s) ln s. */
export type PosteriorSummary = { small: LogSummary; large: LogSummary; sensitivity: LogSummary | null };

/**
 * Adaptive design optimisation of the calibration block for one participant: a grid posterior over
 * (ln k, ln K, ln s), updated by Bayes' rule after each answer under the design's logistic choice
 * model, and the next item chosen from a fixed candidate set to maximise the expected information
 * gain — the mutual information between the answer and the parameters,
 *   I(c) = H(p̄_c) − Σ_θ π(θ) H(p_c(θ)),  p̄_c = Σ_θ π(θ) p_c(θ),
 * H the binary entropy in nats (Myung, Cavagnaro & Pitt 2013, J Math Psych 57:53–67, "A tutorial on
 * adaptive design optimization"; Cavagnaro, Myung, Pitt & Kujala 2010, Neural Comput 22:887–905;
 * Myung & Pitt 2009, Psychol Rev 116:499–518). Formulas: docs/mathematics.md, "Adaptive calibration".
 *
 * A small-magnitude item's answer depends on (k, s) only and a large one's on (K, s), so the
 * likelihood is kept as two tables over (k, s) and (K, s), and each candidate's P(LL) and its
 * entropy are precomputed once over its table: choosing costs two dot products per candidate
 * against the posterior's (k, s) or (K, s) marginal, which is exact (the answer is independent of
 * the other rate given these). Candidates already asked are not asked again.
 */
export class AdaptiveCalibration {
  readonly grid: RateGrid;
  readonly candidates: readonly AdaptiveCandidate[];
  private readonly gamma: number;
  private readonly lapse: number;
  private readonly nk: number;
  private readonly nK: number;
  private readonly ns: number;
  /** per candidate: P(LL) over its (rate, s) table, then the binary entropy of it */
  private readonly pLater: Float64Array[];
  private readonly entropy: Float64Array[];
  private readonly magnitude: Uint8Array;
  private readonly logLikSmall: Float64Array;
  private readonly logLikLarge: Float64Array;
  private readonly weights: Float64Array;
  private readonly marginalSmall: Float64Array;
  private readonly marginalLarge: Float64Array;
  private readonly asked: Uint8Array;
  private fresh = false;
  private answered = 0;

  /**
   * @param options.grid the participant's grid and prior (rateGrid)
   * @param options.candidates the candidate set (calibrationCandidates), 1 to 20,000 items
   * @param options.choice the design's choice model (designChoiceModel)
   * @throws DesignInputError naming `candidates`, `candidates[i].*` or `choice.*`
   */
  constructor(options: { grid: RateGrid; candidates: readonly AdaptiveCandidate[]; choice: ChoiceModel }) {
    const { grid, candidates, choice } = options;
    checkChoiceModel(choice);
    if (!Array.isArray(candidates) || candidates.length === 0 || candidates.length > 20_000) {
      throw new DesignInputError('candidates', 'a list of 1 to 20,000 candidate items', Array.isArray(candidates) ? candidates.length : candidates);
    }
    this.grid = grid;
    this.candidates = candidates;
    this.gamma = choice.sensitivity;
    this.lapse = choice.lapse ?? 0;
    this.nk = grid.logSmall.length;
    this.nK = grid.logLarge.length;
    this.ns = grid.logSensitivity.length;
    this.magnitude = new Uint8Array(candidates.length);
    this.pLater = [];
    this.entropy = [];
    const { id, presentBias } = grid.model;
    const beta = presentBias ?? 1;
    candidates.forEach((c, index) => {
      checkCandidate(c, index);
      const large = c.magnitude === 'large' ? 1 : 0;
      this.magnitude[index] = large;
      const axis = large ? grid.logLarge : grid.logSmall;
      const share = c.soonerAmount / c.laterAmount;
      const p = new Float64Array(axis.length * this.ns);
      const h = new Float64Array(axis.length * this.ns);
      for (let r = 0; r < axis.length; r++) {
        const k = Math.exp(axis[r]);
        for (let m = 0; m < this.ns; m++) {
          const s = Math.exp(grid.logSensitivity[m]);
          const soon = c.soonerDelay === 0 ? 1 : discountAt(id, k, s, beta, c.soonerDelay);
          const q = probabilityLarger(this.gamma, this.lapse, discountAt(id, k, s, beta, c.laterDelay) - share * soon);
          p[r * this.ns + m] = q;
          h[r * this.ns + m] = binaryEntropy(q);
        }
      }
      this.pLater.push(p);
      this.entropy.push(h);
    });
    this.logLikSmall = new Float64Array(this.nk * this.ns);
    this.logLikLarge = new Float64Array(this.nK * this.ns);
    this.weights = new Float64Array(this.nk * this.nK * this.ns);
    this.marginalSmall = new Float64Array(this.nk * this.ns);
    this.marginalLarge = new Float64Array(this.nK * this.ns);
    this.asked = new Uint8Array(candidates.length);
  }

  /** Forgets every answer: the posterior is the prior again (the precomputed tables are kept). */
  reset(): void {
    this.logLikSmall.fill(0);
    this.logLikLarge.fill(0);
    this.asked.fill(0);
    this.answered = 0;
    this.fresh = false;
  }

  /** Number of answers recorded. */
  get answerCount(): number {
    return this.answered;
  }

  /**
   * Records an answer: multiplies the likelihood of the chosen option into the posterior.
   *
   * @throws DesignInputError naming `answer.index` (not a candidate, or already answered) or `answer.choice`
   */
  answer(answer: AdaptiveAnswer): void {
    const { index, choice } = answer;
    if (!(Number.isInteger(index) && index >= 0 && index < this.candidates.length)) {
      throw new DesignInputError('answer.index', `a candidate index from 0 to ${this.candidates.length - 1}`, index);
    }
    if (this.asked[index]) throw new DesignInputError('answer.index', 'a candidate not answered before', index);
    if (choice !== 'SS' && choice !== 'LL') throw new DesignInputError('answer.choice', "'SS' or 'LL'", choice);
    const c = this.candidates[index];
    const large = this.magnitude[index] === 1;
    const axis = large ? this.grid.logLarge : this.grid.logSmall;
    const table = large ? this.logLikLarge : this.logLikSmall;
    const { id, presentBias } = this.grid.model;
    const share = c.soonerAmount / c.laterAmount;
    for (let r = 0; r < axis.length; r++) {
      const k = Math.exp(axis[r]);
      for (let m = 0; m < this.ns; m++) {
        const s = Math.exp(this.grid.logSensitivity[m]);
        const soon = c.soonerDelay === 0 ? 1 : discountAt(id, k, s, presentBias ?? 1, c.soonerDelay);
        const gap = discountAt(id, k, s, presentBias ?? 1, c.laterDelay) - share * soon;
        table[r * this.ns + m] += logChoiceProbability(this.gamma, this.lapse, gap, choice === 'LL');
      }
    }
    this.asked[index] = 1;
    this.answered += 1;
    this.fresh = false;
  }

  /** Normalised posterior weights at the nodes, index (i·nK + j)·ns + m (a view of internal state). */
  posterior(): Float64Array {
    this.refresh();
    return this.weights;
  }

  /** Expected information gain (nats) of every candidate; −Infinity for candidates already answered. */
  information(): Float64Array {
    this.refresh();
    const out = new Float64Array(this.candidates.length);
    for (let c = 0; c < out.length; c++) {
      if (this.asked[c]) {
        out[c] = -Infinity;
        continue;
      }
      const marginal = this.magnitude[c] ? this.marginalLarge : this.marginalSmall;
      const p = this.pLater[c];
      const h = this.entropy[c];
      let mean = 0;
      let conditional = 0;
      for (let t = 0; t < marginal.length; t++) {
        const w = marginal[t];
        mean += w * p[t];
        conditional += w * h[t];
      }
      out[c] = Math.max(0, binaryEntropy(mean) - conditional);
    }
    return out;
  }

  /**
   * The candidate with the largest expected information gain. Candidates within 1e-12 nats of the
   * best are tied; the tie is broken by a uniform draw from the seeded generator
   * createRandom({ seed: seed + 7919·step }), step = answers so far, so the same seed and answers
   * always give the same item. Null when every candidate has been answered.
   *
   * @throws DesignInputError when seed is not a whole number
   */
  choose(options: { seed: number }): AdaptiveChoice | null {
    if (!Number.isSafeInteger(options?.seed)) throw new DesignInputError('seed', 'a whole number', options?.seed);
    const info = this.information();
    let best = -Infinity;
    for (let c = 0; c < info.length; c++) if (info[c] > best) best = info[c];
    if (best === -Infinity) return null;
    const ties: number[] = [];
    for (let c = 0; c < info.length; c++) if (info[c] >= best - 1e-12) ties.push(c);
    const index = ties.length === 1 ? ties[0] : ties[Math.floor(createRandom({ seed: (options.seed + 7919 * this.answered) | 0 }).uniform() * ties.length)];
    return { index, candidate: this.candidates[index], information: info[index] };
  }

  /** Posterior median, mean, SD and central 95 % interval of ln k, ln K and (models with s) ln s. */
  summary(): PosteriorSummary {
    this.refresh();
    const { nk, nK, ns } = this;
    const wk = new Float64Array(nk);
    const wK = new Float64Array(nK);
    const ws = new Float64Array(ns);
    for (let i = 0; i < nk; i++) for (let m = 0; m < ns; m++) wk[i] += this.marginalSmall[i * ns + m];
    for (let j = 0; j < nK; j++) for (let m = 0; m < ns; m++) wK[j] += this.marginalLarge[j * ns + m];
    for (let i = 0; i < nk; i++) for (let m = 0; m < ns; m++) ws[m] += this.marginalSmall[i * ns + m];
    return {
      small: summariseMarginal(this.grid.logSmall, wk),
      large: summariseMarginal(this.grid.logLarge, wK),
      sensitivity: ns > 1 ? summariseMarginal(this.grid.logSensitivity, ws) : null,
    };
  }

  private refresh(): void {
    if (this.fresh) return;
    const { nk, nK, ns, weights } = this;
    const logPrior = this.grid.logPrior;
    let max = -Infinity;
    for (let i = 0; i < nk; i++) {
      for (let j = 0; j < nK; j++) {
        const base = (i * nK + j) * ns;
        for (let m = 0; m < ns; m++) {
          const v = logPrior[base + m] + this.logLikSmall[i * ns + m] + this.logLikLarge[j * ns + m];
          weights[base + m] = v;
          if (v > max) max = v;
        }
      }
    }
    let total = 0;
    for (let t = 0; t < weights.length; t++) {
      const w = Math.exp(weights[t] - max);
      weights[t] = w;
      total += w;
    }
    this.marginalSmall.fill(0);
    this.marginalLarge.fill(0);
    for (let i = 0; i < nk; i++) {
      for (let j = 0; j < nK; j++) {
        const base = (i * nK + j) * ns;
        for (let m = 0; m < ns; m++) {
          const w = weights[base + m] / total;
          weights[base + m] = w;
          this.marginalSmall[i * ns + m] += w;
          this.marginalLarge[j * ns + m] += w;
        }
      }
    }
    this.fresh = true;
  }
}

/** Binary entropy in nats, with 0·ln 0 = 0. */
export function binaryEntropy(p: number): number {
  if (p <= 0 || p >= 1) return 0;
  return -p * Math.log(p) - (1 - p) * Math.log1p(-p);
}

function checkCandidate(c: AdaptiveCandidate, index: number): void {
  const field = `candidates[${index}]`;
  if (c === null || typeof c !== 'object') throw new DesignInputError(field, 'a candidate item', c);
  if (c.magnitude !== 'small' && c.magnitude !== 'large') throw new DesignInputError(`${field}.magnitude`, "'small' or 'large'", c.magnitude);
  if (!(c.laterAmount > 0 && c.laterAmount < Infinity)) throw new DesignInputError(`${field}.laterAmount`, 'a finite amount greater than 0', c.laterAmount);
  if (!(c.soonerAmount > 0 && c.soonerAmount < c.laterAmount)) throw new DesignInputError(`${field}.soonerAmount`, 'an amount above 0 and below the later amount', c.soonerAmount);
  if (!(c.soonerDelay >= 0 && c.soonerDelay < c.laterDelay)) throw new DesignInputError(`${field}.soonerDelay`, 'a delay, 0 or more, below the later delay', c.soonerDelay);
  if (!(c.laterDelay < Infinity)) throw new DesignInputError(`${field}.laterDelay`, 'a finite number of days', c.laterDelay);
}
