import { z } from 'zod';
import '@/lib/shared/validations/error-map';
import { nameText } from '@/lib/shared/validations/text';

export const emailSchema = z.string().trim().toLowerCase().pipe(z.email('Enter a valid e-mail address.')).pipe(z.string().max(254));

export const passwordSchema = z
  .string()
  .min(10, 'Use at least 10 characters.')
  .max(200, 'Use at most 200 characters.');

export const signInSchema = z.strictObject({
  email: emailSchema,
  password: z.string().min(1, 'Enter your password.'),
});
export type SignInInput = z.infer<typeof signInSchema>;

export const signUpSchema = z.strictObject({
  name: nameText({ label: 'The name', min: 2, max: 120, tooShort: 'Enter your name.' }),
  email: emailSchema,
  password: passwordSchema,
});
export type SignUpInput = z.infer<typeof signUpSchema>;

/** Changing one's password while signed in: the current one proves it is really them. */
export const passwordChangeSchema = z.strictObject({
  currentPassword: z.string().min(1, 'Enter your current password.').max(200),
  newPassword: passwordSchema,
});
export type PasswordChangeInput = z.infer<typeof passwordChangeSchema>;

export const passwordChangeFormSchema = passwordChangeSchema
  .extend({ confirm: z.string() })
  .refine((v) => v.newPassword === v.confirm, { path: ['confirm'], message: 'The two passwords differ.' })
  .refine((v) => v.newPassword !== v.currentPassword, { path: ['newPassword'], message: 'Choose a password different from the current one.' });
export type PasswordChangeFormInput = z.infer<typeof passwordChangeFormSchema>;
