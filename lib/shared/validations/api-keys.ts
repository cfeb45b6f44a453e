import { z } from 'zod';

/** Creating an API key: a name people recognise and the frozen design version it serves. */
export const apiKeyCreateSchema = z.strictObject({
  name: z.string().trim().min(1, 'Name the key (e.g. the survey it is for).').max(120, 'Keep the name under 120 characters.'),
  designVersionId: z.number({ error: 'Choose a frozen design version.' }).int().positive('Choose a frozen design version.'),
});
export type ApiKeyCreateInput = z.infer<typeof apiKeyCreateSchema>;
