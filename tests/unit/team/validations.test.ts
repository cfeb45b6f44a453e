import { describe, expect, it } from 'vitest';
import { acceptInvitationSchema, invitationSchema, noticeSettingsSchema, passwordResetFormSchema } from '@/lib/shared/validations/team';

describe('team schemas', () => {
  it('normalise an invited address and accept only known roles', () => {
    expect(invitationSchema.parse({ email: '  New@Example.ORG ', role: 'operator' })).toEqual({ email: 'new@example.org', role: 'operator' });
    expect(invitationSchema.safeParse({ email: 'x@example.org', role: 'admin' }).success).toBe(false);
    expect(invitationSchema.safeParse({ email: 'x@example.org', role: 'viewer', extra: 1 }).success).toBe(false);
  });

  it('accept only tokens of the shape we issue', () => {
    expect(acceptInvitationSchema.safeParse({ token: 'a'.repeat(43) }).success).toBe(true);
    expect(acceptInvitationSchema.safeParse({ token: 'a'.repeat(42) }).success).toBe(false);
    expect(acceptInvitationSchema.safeParse({ token: `${'a'.repeat(42)}/` }).success).toBe(false);
  });

  it('ask for the new password twice on the form', () => {
    const differ = passwordResetFormSchema.safeParse({ password: 'long-enough-1', confirm: 'long-enough-2' });
    expect(differ.success).toBe(false);
    expect(differ.error?.issues[0].path).toEqual(['confirm']);
    expect(passwordResetFormSchema.safeParse({ password: 'long-enough-1', confirm: 'long-enough-1' }).success).toBe(true);
  });

  it('need both notice switches as booleans', () => {
    expect(noticeSettingsSchema.safeParse({ designFrozen: true }).success).toBe(false);
    expect(noticeSettingsSchema.safeParse({ designFrozen: 'yes', powerRunFinished: false }).success).toBe(false);
  });
});
