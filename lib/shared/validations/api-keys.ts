import { z } from 'zod';
import '@/lib/shared/validations/error-map';
import { nameText } from '@/lib/shared/validations/text';

/** Creating an API key: a name people recognise and the frozen design version it serves. */
export const apiKeyCreateSchema = z.strictObject({
  name: nameText({ label: 'The key name', min: 1, max: 120, tooShort: 'Name the key (e.g. the survey it is for).', tooLong: 'Keep the name under 120 characters.' }),
  designVersionId: z.number({ error: 'Choose a frozen design version.' }).int().positive('Choose a frozen design version.'),
});
export type ApiKeyCreateInput = z.infer<typeof apiKeyCreateSchema>;
