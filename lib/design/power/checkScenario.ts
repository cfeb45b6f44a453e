import { checkChoiceModel } from '../choiceProbability';
import { DesignInputError } from '../DesignInputError';
import { checkPrior } from '../ratePrior';
import { checkInteger, checkModel, checkPositive, checkRatio } from '../validate';
import { POWER_TEST_KINDS, type PowerScenario } from './types';

/** Largest number of simulated participants per study and of replicates (keeps runs finite). */
export const POWER_LIMITS = { maxSampleSize: 5000, maxReplications: 100000, maxSampleSizes: 40 } as const;

/**
 * Throws DesignInputError naming the first field of the scenario that is out of range.
 */
export function checkScenario(scenario: PowerScenario): void {
  if (scenario === null || typeof scenario !== 'object') throw new DesignInputError('scenario', 'an object', scenario);
  const { design, truth, test } = scenario;
  const spec = design?.spec;
  if (spec === null || typeof spec !== 'object') throw new DesignInputError('design.spec', 'the frozen design spec', spec);
  checkModel(spec.model);
  checkRatio(spec.ratio);
  checkPositive('design.largeAmount', spec.largeAmount);
  checkPositive('design.soonDelay', design.soonDelay);
  if (!(spec.lateDelayLimit > design.soonDelay && spec.lateDelayLimit < Infinity)) {
    throw new DesignInputError('design.lateDelayLimit', `a finite number of days above the soon delay (${design.soonDelay})`, spec.lateDelayLimit);
  }
  if (spec.mode !== 'personalised' && spec.mode !== 'population') throw new DesignInputError('design.mode', "'personalised' or 'population'", spec.mode);
  checkInteger('design.probePairs', spec.probePairs, 1, 100);
  checkInteger('design.lateAnchors', spec.lateAnchors, 0, 100);
  checkInteger('design.soonAnchors', spec.soonAnchors, 0, 100);
  checkInteger('design.calibration.itemsPerMagnitude', spec.calibration.itemsPerMagnitude, 2, 40);
  checkPositive('design.calibration.minDelay', spec.calibration.minDelay);
  if (!(spec.calibration.maxDelay >= spec.calibration.minDelay && spec.calibration.maxDelay < Infinity)) {
    throw new DesignInputError('design.calibration.maxDelay', `a finite number of days, at least the shortest (${spec.calibration.minDelay})`, spec.calibration.maxDelay);
  }
  checkPrior(design.prior, 'design.prior');
  checkModel(truth.model);
  checkPrior(truth.prior, 'truth.prior');
  checkChoiceModel({ sensitivity: truth.gamma, lapse: truth.lapse }, 'truth');
  if (truth.sensitivityRange !== undefined) {
    const { low, high } = truth.sensitivityRange ?? {};
    if (!['hyperboloid', 'power-delay', 'exponential-power'].includes(truth.model.id)) {
      throw new DesignInputError('truth.sensitivityRange', 'a range only for a true model with a delay sensitivity s', truth.model.id);
    }
    if (!(low > 0 && high >= low && high < Infinity)) throw new DesignInputError('truth.sensitivityRange', 'a range 0 < low ≤ high', truth.sensitivityRange);
  }
  if (truth.presentBias !== undefined && !(truth.presentBias > 0 && truth.presentBias <= 1)) {
    throw new DesignInputError('truth.presentBias', 'a present bias β above 0 and at most 1', truth.presentBias);
  }
  if (scenario.calibration !== 'simulated' && scenario.calibration !== 'adaptive' && scenario.calibration !== 'known') throw new DesignInputError('calibration', "'simulated', 'adaptive' or 'known'", scenario.calibration);
  if (!POWER_TEST_KINDS.includes(test?.kind)) throw new DesignInputError('test.kind', POWER_TEST_KINDS.map((k) => `'${k}'`).join(', '), test?.kind);
  if (!(test.alpha > 0 && test.alpha < 1)) throw new DesignInputError('test.alpha', 'a number strictly between 0 and 1', test.alpha);
  if (test.alternative !== 'greater' && test.alternative !== 'two-sided') throw new DesignInputError('test.alternative', "'greater' or 'two-sided'", test.alternative);
  if (test.kind === 'probes-vs-anchors' && spec.lateAnchors + spec.soonAnchors === 0) {
    throw new DesignInputError('test.kind', 'a test the design can run: probes-vs-anchors needs anchor pairs', test.kind);
  }
  const sizes = scenario.sampleSizes;
  if (!Array.isArray(sizes) || sizes.length === 0 || sizes.length > POWER_LIMITS.maxSampleSizes) {
    throw new DesignInputError('sampleSizes', `a list of 1 to ${POWER_LIMITS.maxSampleSizes} sample sizes`, sizes);
  }
  sizes.forEach((n, i) => {
    checkInteger(`sampleSizes[${i}]`, n, 1, POWER_LIMITS.maxSampleSize);
    if (i > 0 && !(n > sizes[i - 1])) throw new DesignInputError(`sampleSizes[${i}]`, `a size above the one before (${sizes[i - 1]})`, n);
  });
  checkInteger('replications', scenario.replications, 1, POWER_LIMITS.maxReplications);
  if (!Number.isSafeInteger(scenario.seed) || scenario.seed < 0) throw new DesignInputError('seed', 'a whole number, 0 or more', scenario.seed);
}
