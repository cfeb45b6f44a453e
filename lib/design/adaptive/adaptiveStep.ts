import { DesignInputError } from '../DesignInputError';
import type { AdaptiveAnswer, AdaptiveCalibration, AdaptiveChoice, PosteriorSummary } from './adaptiveCalibration';
import type { LogSummary } from './ratePosterior';

/** When adaptive calibration stops: after maxItems answers, or once the posterior SD of both ln k and ln K is at most targetSd. */
export type AdaptiveStopRule = {
  /** 1 to 200 answers */
  maxItems: number;
  /** posterior SD of ln k and of ln K, 0 (never stop early) to 5 */
  targetSd: number;
};

/** Where a participant's adaptive calibration stands after their answers so far. */
export type AdaptiveStep = {
  /** answers recorded */
  answered: number;
  /** true when calibration is over; `next` is then null */
  done: boolean;
  reason: 'max-items' | 'target-sd' | 'no-candidates' | null;
  next: AdaptiveChoice | null;
  summary: PosteriorSummary;
};

/**
 * One step of adaptive calibration, replayed from the answers so far: resets the engine, records
 * every answer in order, then either stops (stop rule met, or no candidate left) or names the
 * next item (AdaptiveCalibration.choose with the participant's seed). Deterministic: the same
 * answers and seed give the same step, so a server can store only the answers and answer any
 * repeated request for a step identically.
 *
 * @throws DesignInputError naming `stop.maxItems`, `stop.targetSd`, `answers` or `answer.*`
 */
export function adaptiveStep(engine: AdaptiveCalibration, options: { answers: readonly AdaptiveAnswer[]; seed: number; stop: AdaptiveStopRule }): AdaptiveStep {
  const { answers, stop } = options;
  checkStopRule(stop);
  if (!Array.isArray(answers)) throw new DesignInputError('answers', 'a list of answers', answers);
  if (answers.length > stop.maxItems) throw new DesignInputError('answers', `at most ${stop.maxItems} answers (the stop rule's maximum)`, answers.length);
  engine.reset();
  for (const answer of answers) engine.answer(answer);
  const summary = engine.summary();
  const answered = answers.length;
  let reason: AdaptiveStep['reason'] = null;
  if (answered >= stop.maxItems) reason = 'max-items';
  else if (summary.small.sd <= stop.targetSd && summary.large.sd <= stop.targetSd) reason = 'target-sd';
  const next = reason === null ? engine.choose({ seed: options.seed }) : null;
  if (reason === null && next === null) reason = 'no-candidates';
  return { answered, done: reason !== null, reason, next, summary };
}

/**
 * Checks a stop rule.
 *
 * @throws DesignInputError naming `stop.maxItems` (a whole number from 1 to 200) or `stop.targetSd` (0 to 5)
 */
export function checkStopRule(stop: AdaptiveStopRule): void {
  if (stop === null || typeof stop !== 'object') throw new DesignInputError('stop', 'an object { maxItems, targetSd }', stop);
  if (!(Number.isInteger(stop.maxItems) && stop.maxItems >= 1 && stop.maxItems <= 200)) throw new DesignInputError('stop.maxItems', 'a whole number from 1 to 200', stop.maxItems);
  if (!(stop.targetSd >= 0 && stop.targetSd <= 5)) throw new DesignInputError('stop.targetSd', 'a number from 0 to 5 (SD of ln k)', stop.targetSd);
}

/** A rate as stage 2 reads it: the posterior median, the posterior SD of ln k and the central 95 % interval. */
export type PosteriorRate = {
  /** exp(posterior median of ln k), per day */
  rate: number;
  /** posterior SD of ln k */
  standardErrorLog: number;
  interval: { lower: number; upper: number };
};

/**
 * The estimates handed to stage 2: per rate, exp of the posterior median of ln k (a median is
 * invariant under exp, so it is also the posterior median of k), the posterior SD of ln k and the
 * central 95 % posterior interval, exp'd.
 *
 * @example posteriorRates(step.summary).kSmall.rate // exp(step.summary.small.median)
 */
export function posteriorRates(summary: PosteriorSummary): { kSmall: PosteriorRate; kLarge: PosteriorRate; sensitivity: number | null } {
  const rate = (s: LogSummary): PosteriorRate => ({ rate: Math.exp(s.median), standardErrorLog: s.sd, interval: { lower: Math.exp(s.lower), upper: Math.exp(s.upper) } });
  return { kSmall: rate(summary.small), kLarge: rate(summary.large), sensitivity: summary.sensitivity ? Math.exp(summary.sensitivity.median) : null };
}
