import { afterEach, describe, expect, it } from 'vitest';
import { appLink } from '@/lib/server/mail/links';
import { designFrozenMessage, invitationMessage, passwordResetMessage, powerRunFinishedMessage } from '@/lib/server/mail/templates';

const saved = process.env.NEXTAUTH_URL;
afterEach(() => {
  process.env.NEXTAUTH_URL = saved;
});

describe('links in messages', () => {
  it('use NEXTAUTH_URL as their base, without doubled slashes', () => {
    process.env.NEXTAUTH_URL = 'https://switchback.lab.example/';
    expect(appLink('/invitations/abc')).toBe('https://switchback.lab.example/invitations/abc');
    expect(appLink('reset-password/x')).toBe('https://switchback.lab.example/reset-password/x');
  });
});

describe('the invitation message', () => {
  const message = invitationMessage({
    to: 'new@example.org',
    studyName: 'Bonus <timing> & "pay"',
    inviterName: 'Rowan',
    role: 'editor',
    link: 'http://127.0.0.1:3000/invitations/tok',
    expiresAt: new Date('2026-12-09T10:00:00Z'),
  });

  it('names the study, the role, the link and when it stops working', () => {
    expect(message.to).toBe('new@example.org');
    expect(message.subject).toContain('Bonus <timing>');
    expect(message.text).toContain('as editor');
    expect(message.text).toContain('http://127.0.0.1:3000/invitations/tok');
    expect(message.text).toContain('9 Dec 2026'); // the app's one date format (lib/shared/format.ts)
  });

  it('escapes the study name in the HTML part', () => {
    expect(message.html).toContain('Bonus &lt;timing&gt; &amp; &quot;pay&quot;');
    expect(message.html).not.toContain('<timing>');
  });
});

describe('other messages', () => {
  it('carry their links and their facts', () => {
    const reset = passwordResetMessage({ to: 'a@example.org', link: 'http://h/reset-password/t', expiresAt: new Date('2026-12-02T05:00:00Z') });
    expect(reset.text).toContain('http://h/reset-password/t');
    expect(reset.text).toContain('once');
    const frozen = designFrozenMessage({ to: 'a@example.org', studyName: 'S', actorName: 'Emery', versionHash: 'f'.repeat(64), link: 'http://h/studies/1' });
    expect(frozen.text).toContain('Emery froze a design');
    expect(frozen.text).toContain('ffffffffffff');
    const run = powerRunFinishedMessage({ to: 'a@example.org', studyName: 'S', runId: 12, link: 'http://h/studies/1' });
    expect(run.subject).toContain('#12');
    expect(run.text).toContain('estimates');
  });
});
