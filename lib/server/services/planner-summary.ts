import { DesignInputError } from '@/lib/design';
import { ValidationError } from '@/lib/server/errors';
import { computeDesignSummary } from '@/lib/shared/planner/summary';
import type { DesignSummary } from '@/lib/shared/planner/types';
import { getDesignWithPrior } from './planner-designs';

/**
 * The design page's numbers computed on the server with the same lib/shared/planner function the
 * browser runs, from the stored draft and its prior's current values.
 */
export async function designSummary(studyId: number, designId: number): Promise<{ summary: DesignSummary; designVersion: number }> {
  const { design, content } = await getDesignWithPrior(studyId, designId);
  try {
    return { summary: computeDesignSummary({ spec: content.spec, prior: content.prior }), designVersion: design.version };
  } catch (error) {
    if (error instanceof DesignInputError) throw new ValidationError([{ path: error.field, message: error.message }], 'The design’s numbers are outside the range the planner can compute.');
    throw error;
  }
}
