import { z } from 'zod';
import { MODEL_IDS } from '@/lib/design';

/** Exclusion rules as a form and the API send them (each on or off; the floor in milliseconds). */
export const exclusionRulesSchema = z
  .object({
    attentionCheck: z.boolean(),
    flaggedEstimates: z.boolean(),
    incompleteBlocks: z.boolean(),
    responseTimeFloor: z.object({ enabled: z.boolean(), ms: z.number().int().min(0).max(60_000) }).strict(),
  })
  .strict();

/** A new analysis: its name, the frozen version it analyses and the rules stated before looking. */
export const analysisCreateSchema = z
  .object({
    name: z.string().trim().min(1, 'Name the analysis.').max(120),
    designVersionId: z.number().int().positive(),
    exclusions: exclusionRulesSchema,
    alternative: z.enum(['two-sided', 'greater']),
    alpha: z.number().gt(0).lt(1).default(0.05),
    zoneModel: z.enum(['aic', 'bic', ...MODEL_IDS] as [string, ...string[]]).default('bic'),
  })
  .strict();

export type AnalysisCreate = z.infer<typeof analysisCreateSchema>;
export type ExclusionRulesInput = z.infer<typeof exclusionRulesSchema>;

/** The rules a new analysis starts from on the results page (common practice: all on, no response-time floor). */
export const DEFAULT_EXCLUSIONS: ExclusionRulesInput = { attentionCheck: true, flaggedEstimates: true, incompleteBlocks: true, responseTimeFloor: { enabled: false, ms: 300 } };
