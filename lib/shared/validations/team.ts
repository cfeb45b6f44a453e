import { z } from 'zod';
import '@/lib/shared/validations/error-map';
import { ROLES } from '@/lib/shared/roles';
import { emailSchema, passwordSchema } from './user';

const roleSchema = z.enum(ROLES, { error: `Choose one of: ${ROLES.join(', ')}.` });
/** Tokens are 43 base64url characters (32 random bytes); anything else cannot be one of ours. */
const tokenSchema = z.string({ error: 'token is required.' }).regex(/^[A-Za-z0-9_-]{43}$/, 'This link is not a valid Switchback link.');

/** An owner's invitation: who, and with which role. */
export const invitationSchema = z.strictObject({ email: emailSchema, role: roleSchema });
export type InvitationInput = z.infer<typeof invitationSchema>;

/** A role change of one member. */
export const memberRoleSchema = z.strictObject({ role: roleSchema });
export type MemberRoleInput = z.infer<typeof memberRoleSchema>;

/** Accepting an invitation by the token from its link. */
export const acceptInvitationSchema = z.strictObject({ token: tokenSchema });

/** Confirming an account's address with the token from the confirmation link. */
export const addressConfirmationSchema = z.strictObject({ token: tokenSchema });

/** Asking for a password-reset link. */
export const passwordResetRequestSchema = z.strictObject({ email: emailSchema });
export type PasswordResetRequestInput = z.infer<typeof passwordResetRequestSchema>;

/** Choosing a new password with the token from the reset link. */
export const passwordResetSchema = z.strictObject({ token: tokenSchema, password: passwordSchema });
export type PasswordResetInput = z.infer<typeof passwordResetSchema>;

/** The reset form asks for the password twice; the server needs it once. */
export const passwordResetFormSchema = passwordResetSchema
  .omit({ token: true })
  .extend({ confirm: z.string() })
  .refine((v) => v.password === v.confirm, { path: ['confirm'], message: 'The two passwords differ.' });
export type PasswordResetFormInput = z.infer<typeof passwordResetFormSchema>;

/** A user's optional e-mail notices. */
export const noticeSettingsSchema = z.strictObject({
  designFrozen: z.boolean({ error: 'designFrozen must be true or false.' }),
  powerRunFinished: z.boolean({ error: 'powerRunFinished must be true or false.' }),
});
export type NoticeSettingsInput = z.infer<typeof noticeSettingsSchema>;
