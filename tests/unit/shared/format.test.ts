import { describe, expect, it } from 'vitest';
import { formatDate, formatDateTime } from '@/lib/shared/format';
import { invitationMessage, passwordResetMessage } from '@/lib/server/mail/templates';

describe('one date format on pages and in e-mails', () => {
  it('writes a moment as day, short month, year, 24-hour time and UTC', () => {
    expect(formatDateTime('2026-12-02T14:05:59.999Z')).toBe('2 Dec 2026, 14:05 UTC');
    expect(formatDateTime(new Date(Date.UTC(2027, 0, 9, 0, 7)))).toBe('9 Jan 2027, 00:07 UTC');
  });

  it('reads the same whatever the reader’s time zone: an ISO string with an offset is shown in UTC', () => {
    expect(formatDateTime('2026-12-03T00:30:00+02:00')).toBe('2 Dec 2026, 22:30 UTC');
  });

  it('writes midnight as 00:00, never 24:00', () => {
    expect(formatDateTime('2026-06-30T00:00:00Z')).toBe('30 Jun 2026, 00:00 UTC');
  });

  it('writes a calendar day without a time', () => {
    expect(formatDate('2026-12-02T23:59:00Z')).toBe('2 Dec 2026');
  });

  it('shows a dash for something that is not a date instead of "Invalid Date"', () => {
    expect(formatDateTime('not a date')).toBe('—');
    expect(formatDate('')).toBe('—');
  });

  it('is the format the invitation and password-reset e-mails use', () => {
    const expiresAt = new Date('2026-12-09T08:15:00Z');
    const invite = invitationMessage({ to: 'a@example.org', studyName: 'S', inviterName: 'Rowan', role: 'editor', link: 'http://x/i', expiresAt });
    const reset = passwordResetMessage({ to: 'a@example.org', link: 'http://x/r', expiresAt });
    expect(invite.text).toContain('until 9 Dec 2026, 08:15 UTC');
    expect(reset.text).toContain('until 9 Dec 2026, 08:15 UTC');
  });
});

describe('the invitation e-mail', () => {
  it('invites rather than saying the person was already added, since nothing happens until they accept', () => {
    const m = invitationMessage({ to: 'a@example.org', studyName: 'Rainy-day savings', inviterName: 'Rowan', role: 'viewer', link: 'http://x/i', expiresAt: new Date('2026-12-09T08:15:00Z') });
    expect(m.text).not.toMatch(/has added you|have been added|has been added/);
    expect(m.text).toContain('Rowan invites you to join the study “Rainy-day savings”');
    expect(m.text).toContain('Once you accept');
  });
});
