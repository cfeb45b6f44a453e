import { calibrationPlacement, describeCalibration, stageOneFit } from '../item-bank/calibrationPlan';
import { sensitivityModel } from './stressTruth';
import type { PowerScenario } from './types';

/**
 * The other calibration of a design, simulated beside its own so a power run shows what the
 * choice buys: a design with today's block (delays in its set range, the design model with s
 * fixed) is compared with calibration delays spanning the probes and stage 1 estimating delay
 * sensitivity under the model of its family that has an s (stressTruth's sensitivityModel); a
 * design that already spans the probes or estimates s is compared with today's block.
 */
export function calibrationVariant(scenario: PowerScenario): PowerScenario {
  const { design } = scenario;
  const today = calibrationPlacement(design.spec) === 'range' && stageOneFit(design.spec) === 'design-model';
  const { placement: _p, fit: _f, ...base } = design.spec.calibration;
  const calibration = today ? { ...base, placement: 'span-probes' as const, fit: sensitivityModel(design.spec.model) } : base;
  return { ...scenario, design: { ...design, spec: { ...design.spec, calibration } } };
}

/** The calibration of a scenario's design in words (describeCalibration). */
export function calibrationLabel(scenario: PowerScenario): string {
  return describeCalibration(scenario.design.spec);
}
