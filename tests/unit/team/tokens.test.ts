import { describe, expect, it } from 'vitest';
import { hashToken, newToken } from '@/lib/server/auth/tokens';

describe('link tokens', () => {
  it('are hashed with SHA-256', () => {
    // FIPS 180-2, appendix B.1: SHA-256("abc").
    expect(hashToken('abc')).toBe('ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad');
  });

  it('are 43 base64url characters, differ every time, and come with their hash', () => {
    const a = newToken();
    const b = newToken();
    expect(a.token).toMatch(/^[A-Za-z0-9_-]{43}$/);
    expect(a.token).not.toBe(b.token);
    expect(a.hash).toBe(hashToken(a.token));
    expect(a.hash).not.toContain(a.token);
  });
});
