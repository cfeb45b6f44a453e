import { z } from 'zod';
import '@/lib/shared/validations/error-map';
import { freeText, nameText } from '@/lib/shared/validations/text';

/** The one schema of a study's editable fields, shared by the forms and the route handlers. */
export const studySchema = z.strictObject({
  name: nameText({ label: 'The study name', min: 3, max: 160, tooShort: 'Give the study a name of at least 3 characters.', tooLong: 'Keep the name under 160 characters.' }),
  description: freeText({ label: 'The description', max: 4000, tooLong: 'Keep the description under 4,000 characters.' }).default(''),
});

export const createStudySchema = studySchema;
export type CreateStudyInput = z.input<typeof createStudySchema>;

/** A rename or description change names the version it was based on (optimistic locking). */
export const updateStudySchema = studySchema.partial().extend({
  version: z.number({ error: 'version is required: send the version you read.' }).int().positive(),
});
export type UpdateStudyInput = z.infer<typeof updateStudySchema>;
