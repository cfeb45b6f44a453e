import type { ExclusionReport, ModelComparison, ModelFit, ModelId, RolePatterns, ReversalTests, StudyAnalysis, ZoneDiagnosis } from '@/lib/design';

/** One participant's fit of one model as stored: parameters with intervals, fit and prediction. */
export type StoredFit = {
  model: ModelId;
  kSmall: ModelFit['kSmall'];
  kLarge: ModelFit['kLarge'];
  shape: ModelFit['shape'];
  logLikelihood: number;
  aic: number;
  bic: number;
  parameterCount: number;
  choiceCount: number;
  converged: boolean;
  predictiveLogScore: number;
  predictedChoices: number;
};

/** What a saved analysis keeps (and the JSON download holds): everything the results page shows. */
export type StoredAnalysis = {
  participantsTotal: number;
  participantsAnalysed: number;
  exclusions: Omit<ExclusionReport, 'kept'>;
  patterns: RolePatterns[];
  tests: ReversalTests;
  alpha: number;
  comparison: ModelComparison;
  zones: ZoneDiagnosis | null;
  participants: Array<{ participantId: string; design: { kSmall: number; kLarge: number }; fits: StoredFit[] }>;
  options: StudyAnalysis['options'];
};

/** The stored form of an analysis: refits reduced to what is reported per participant and model. */
export function storeAnalysis(a: StudyAnalysis): StoredAnalysis {
  return {
    participantsTotal: a.participantsTotal,
    participantsAnalysed: a.participantsAnalysed,
    exclusions: a.exclusions,
    patterns: a.patterns,
    tests: a.tests,
    alpha: a.alpha,
    comparison: a.comparison,
    zones: a.zones,
    participants: a.refits.map((r) => ({
      participantId: r.participantId,
      design: { kSmall: r.design.parameters.kSmall, kLarge: r.design.parameters.kLarge },
      fits: r.models.map((m) => ({
        model: m.model,
        kSmall: m.full.kSmall,
        kLarge: m.full.kLarge,
        shape: m.full.shape,
        logLikelihood: m.full.logLikelihood,
        aic: m.full.aic,
        bic: m.full.bic,
        parameterCount: m.full.parameterCount,
        choiceCount: m.full.choiceCount,
        converged: m.full.converged && m.calibrationOnly.converged,
        predictiveLogScore: m.predictiveLogScore,
        predictedChoices: m.predictedChoices,
      })),
    })),
    options: a.options,
  };
}

/** Short labels of the expectation sources and models, as tables and figures show them. */
export const SOURCE_LABELS: Record<string, string> = {
  observed: 'Observed',
  design: 'Design model (serving estimates)',
  exponential: 'Exponential',
  hyperbolic: 'Hyperbolic',
  hyperboloid: 'Hyperboloid',
  'power-delay': 'Power-delay',
  'exponential-power': 'Exponential-power',
  'quasi-hyperbolic': 'Quasi-hyperbolic',
};

export const ROLE_LABELS: Record<string, string> = { 'late-anchor': 'Late anchors', 'reversal-probe': 'Reversal probes', 'soon-anchor': 'Soon anchors' };
