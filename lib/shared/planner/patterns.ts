import { discountFactor, type ModelSpec } from '@/lib/design';
import type { PatternShares } from './types';

/**
 * Probabilities of the four choice patterns of one pair under logistic choice, the two views
 * independent given the rates: P(LL far) = σ(γA), P(SS near) = σ(γB).
 */
export function patternProbabilities(model: ModelSpec, ratio: number, soonDelay: number, lateDelay: number, kSmall: number, kLarge: number, gamma: number): PatternShares {
  const far = discountFactor(model, kLarge, lateDelay) - ratio * discountFactor(model, kSmall, soonDelay);
  const near = ratio - discountFactor(model, kLarge, lateDelay - soonDelay);
  const pFarL = logistic(gamma * far);
  const pNearS = logistic(gamma * near);
  return { LL: pFarL * (1 - pNearS), LS: pFarL * pNearS, SL: (1 - pFarL) * (1 - pNearS), SS: (1 - pFarL) * pNearS };
}

function logistic(z: number): number {
  if (z >= 0) return 1 / (1 + Math.exp(-z));
  const e = Math.exp(z);
  return e / (1 + e);
}

/** Adds `w` times `b` into `a` (pattern by pattern). */
export function addShares(a: PatternShares, b: PatternShares, w: number): void {
  a.LL += w * b.LL;
  a.LS += w * b.LS;
  a.SL += w * b.SL;
  a.SS += w * b.SS;
}

/** Four zero shares, to accumulate into. */
export const noShares = (): PatternShares => ({ LL: 0, LS: 0, SL: 0, SS: 0 });
