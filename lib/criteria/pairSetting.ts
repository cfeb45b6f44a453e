import { checkChoiceModel, checkDelay, checkLateDelay, checkModel, checkRatio, DesignInputError, type ChoiceModel, type ModelSpec, type RatePoints } from '@/lib/design';

/** A question pair's design settings, without the rates (they come from a prior). */
export type PairSetting = { model: ModelSpec; ratio: number; soonDelay: number; lateDelay: number };

export function checkSetting(setting: PairSetting): void {
  checkModel(setting.model);
  checkRatio(setting.ratio);
  checkDelay('soonDelay', setting.soonDelay);
  checkLateDelay(setting.lateDelay, setting.soonDelay);
}

export function checkPoints(points: RatePoints): void {
  if (!points || !(points.kSmall instanceof Float64Array) || !(points.kLarge instanceof Float64Array) || points.kSmall.length !== points.kLarge.length || points.kSmall.length === 0) {
    throw new DesignInputError('points', 'rate points from priorPoints (equal-length, non-empty)', points);
  }
  if (points.weights !== null && !(points.weights instanceof Float64Array && points.weights.length === points.kSmall.length)) {
    throw new DesignInputError('points.weights', 'null or one weight per point', points.weights);
  }
}

export { checkChoiceModel, type ChoiceModel };
