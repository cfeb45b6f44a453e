import { extrapolationWarning } from '../extrapolationWarning';
import { sampleSizeFor, type SampleSizeAnswer } from './sampleSizeFor';
import { wilsonInterval } from './wilsonInterval';
import { PAIR_ROLES, type PairRole, type PowerScenario, type PowerTally } from './types';

export type PatternShares = { LL: number; LS: number; SL: number; SS: number; pairs: number };

/** One point of the power curve with its diagnostics. */
export type PowerPoint = {
  n: number;
  power: number;
  /** Wilson 95 % interval of the power (replicates as trials) */
  lower: number;
  upper: number;
  rejections: number;
  /** LS patterns among a participant's probe pairs, averaged over participants and replicates */
  meanReversals: number;
  patterns: Record<PairRole, PatternShares>;
  flaggedShare: number;
  /** share of participants served the fallback set (flagged estimates, or no zone at them) */
  fallbackShare: number;
  /** share of probe pairs whose late delay is inside the participant's true reversal zone */
  probesInTrueZone: number;
};

export type PowerWarning = { kind: 'model-mismatch' | 'misplaced-probes' | 'extrapolation' | 'extrapolation-risk' | 'stress' | 'flagged' | 'underpowered'; message: string };

export type PowerSummary = {
  points: PowerPoint[];
  replicates: number;
  sampleSizeFor80: SampleSizeAnswer;
  sampleSizeFor90: SampleSizeAnswer;
  warnings: PowerWarning[];
};

const PATTERN_NAMES = ['LL', 'LS', 'SL', 'SS'] as const;

/** Shares, intervals, sample sizes for 80 % and 90 % power, and the warnings a reader must see. */
export function summarisePower(scenario: PowerScenario, tally: PowerTally, longestCalibrationDelay: number | null): PowerSummary {
  const R = tally.replicates;
  const points = tally.sampleSizes.map((n, j): PowerPoint => {
    const interval = wilsonInterval(tally.rejections[j], R);
    const patterns = {} as Record<PairRole, PatternShares>;
    for (const role of PAIR_ROLES) {
      const row = tally.patterns[role][j];
      const pairs = row[0] + row[1] + row[2] + row[3];
      const share = (v: number) => (pairs > 0 ? v / pairs : 0);
      patterns[role] = { LL: share(row[0]), LS: share(row[1]), SL: share(row[2]), SS: share(row[3]), pairs };
    }
    const people = n * R;
    const probes = patterns.probe.pairs;
    return {
      n,
      power: R > 0 ? tally.rejections[j] / R : 0,
      lower: interval.lower,
      upper: interval.upper,
      rejections: tally.rejections[j],
      meanReversals: people > 0 ? tally.probeReversals[j] / people : 0,
      patterns,
      flaggedShare: people > 0 ? tally.flagged[j] / people : 0,
      fallbackShare: people > 0 ? tally.fallback[j] / people : 0,
      probesInTrueZone: probes > 0 ? tally.probesInTrueZone[j] / probes : 0,
    };
  });
  return {
    points,
    replicates: R,
    sampleSizeFor80: sampleSizeFor(points, 0.8),
    sampleSizeFor90: sampleSizeFor(points, 0.9),
    warnings: powerWarnings(scenario, points, tally, longestCalibrationDelay),
  };
}

function sameModel(a: PowerScenario['truth']['model'], b: PowerScenario['truth']['model']): boolean {
  return a.id === b.id && (a.sensitivity ?? 1) === (b.sensitivity ?? 1) && (a.presentBias ?? 1) === (b.presentBias ?? 1);
}

function percent(v: number): string {
  return `${Math.round(v * 1000) / 10} %`;
}

function powerWarnings(scenario: PowerScenario, points: PowerPoint[], tally: PowerTally, longestCalibrationDelay: number | null): PowerWarning[] {
  const warnings: PowerWarning[] = [];
  const last = points[points.length - 1];
  const { design, truth } = scenario;
  if (!sameModel(design.spec.model, truth.model)) {
    warnings.push({
      kind: 'model-mismatch',
      message: `The simulated truth (${describeModel(truth.model)}) differs from the model the probes are built for (${describeModel(design.spec.model)}).`,
    });
  }
  if (last.probesInTrueZone < 0.5) {
    warnings.push({
      kind: 'misplaced-probes',
      message:
        `Only ${percent(last.probesInTrueZone)} of probe pairs fell inside the participants' true reversal zone: ` +
        (sameModel(design.spec.model, truth.model)
          ? 'the rates estimated from the calibration block often place the probes outside it.'
          : 'the probes are built for a model that does not match the simulated truth, and power suffers for it.'),
    });
  }
  if (longestCalibrationDelay !== null && tally.longestProbeDelay > 0) {
    const warning = extrapolationWarning({ calibrationDelays: [longestCalibrationDelay], probeDelays: [tally.longestProbeDelay] });
    if (warning) warnings.push({ kind: 'extrapolation', message: warning.message });
  }
  if (last.flaggedShare > 0.1) {
    warnings.push({
      kind: 'flagged',
      message: `${percent(last.flaggedShare)} of simulated participants had a flagged rate estimate (all choices one way, a boundary estimate, or inconsistent choices).`,
    });
  }
  if (last.power < 0.8) {
    warnings.push({ kind: 'underpowered', message: `Power stays below 80 % up to the largest sample size simulated (N = ${last.n}).` });
  }
  return warnings;
}

/** A model's published name with its shape parameters, e.g. "hyperboloid (Myerson & Green), s = 0.6". */
export function describeModel(model: PowerScenario['truth']['model']): string {
  const names: Record<string, string> = {
    exponential: 'exponential (Samuelson)',
    hyperbolic: 'hyperbolic (Mazur)',
    hyperboloid: 'hyperboloid (Myerson & Green)',
    'power-delay': 'power-delay hyperbola (Rachlin)',
    'exponential-power': 'exponential with delay sensitivity (Ebert & Prelec)',
    'quasi-hyperbolic': 'quasi-hyperbolic (Laibson)',
  };
  let text = names[model.id] ?? model.id;
  if (['hyperboloid', 'power-delay', 'exponential-power'].includes(model.id)) text += `, s = ${model.sensitivity ?? 1}`;
  if (model.id === 'quasi-hyperbolic') text += `, β = ${model.presentBias ?? 1}`;
  return text;
}

export { PATTERN_NAMES };
