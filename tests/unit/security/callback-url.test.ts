import { describe, expect, it } from 'vitest';
import { safeCallbackPath, safeRedirectUrl } from '@/lib/shared/callback-url';

// Each hostile input is one a browser (WHATWG URL parsing, as Chromium and Firefox do) would
// follow to another host, or that decodes to such a string.
const hostile = [
  '//evil.example',
  '//evil.example/studies',
  '/\\evil.example',
  '\\\\evil.example',
  '/\\/evil.example',
  '\\/evil.example',
  '/\t/evil.example',
  '/\n/evil.example',
  '/\r/evil.example',
  '/ /evil.example',
  '/\u0000/evil.example',
  '/\u001f/evil.example',
  '/\u007f/evil.example',
  '/\u00a0/evil.example',
  '/\u3000/evil.example',
  '/\ufeff/evil.example',
  '/%2F/evil.example',
  '/%2f%2fevil.example',
  '/%5Cevil.example',
  '/%5cevil.example',
  '/%09/evil.example',
  '/%0a/evil.example',
  '/%0D/evil.example',
  '/%20/evil.example',
  '%2F%2Fevil.example',
  '/%E0%A4%A',
  'https://evil.example',
  'http:evil.example',
  'https:/evil.example',
  'javascript:alert(1)',
  'JavaScript:alert(1)',
  'data:text/html,<script>alert(1)</script>',
  'evil.example',
  ' /studies',
  '',
  '/'.padEnd(2001, 'a'),
];

describe('the sign-in callback', () => {
  it.each(hostile.map((input) => [JSON.stringify(input), input]))('refuses %s and goes to the study list', (_label, input) => {
    expect(safeCallbackPath(input)).toBe('/studies');
  });

  it('refuses values that are not text', () => {
    for (const value of [undefined, null, 42, ['/studies/1'], { href: '/studies/1' }]) expect(safeCallbackPath(value)).toBe('/studies');
  });

  it.each([
    ['/studies', '/studies'],
    ['/studies/12/team', '/studies/12/team'],
    ['/invitations/abc-123?from=mail#accept', '/invitations/abc-123?from=mail#accept'],
    ['/studies/12/../13', '/studies/13'],
    ['/search?q=%2F%2Fnot-a-host', '/search?q=%2F%2Fnot-a-host'],
  ])('keeps the app path %s', (input, expected) => {
    expect(safeCallbackPath(input)).toBe(expected);
  });

  it('uses the fallback it is given', () => {
    expect(safeCallbackPath('//evil.example', '/account')).toBe('/account');
  });
});

describe("next-auth's redirect rule", () => {
  const base = 'http://127.0.0.1:3000';
  it.each([
    ['/studies/3', `${base}/studies/3`],
    [`${base}/studies/3?x=1`, `${base}/studies/3?x=1`],
    ['http://127.0.0.1:3130/studies', `${base}/studies`],
    ['https://evil.example/', `${base}/studies`],
    ['//evil.example', `${base}/studies`],
    ['/\\evil.example', `${base}/studies`],
    [`${base}//evil.example`, `${base}/studies`],
    ['not a url', `${base}/studies`],
  ])('sends %s to %s', (url, expected) => {
    expect(safeRedirectUrl(url, base)).toBe(expected);
  });
});

describe('the sign-up page', () => {
  it.each(hostile.map((input) => [JSON.stringify(input), input]))('hands the form the study list for %s', async (_label, input) => {
    const { default: SignUpPage } = await import('@/app/(auth)/sign-up/page');
    const page = (await SignUpPage({ searchParams: Promise.resolve({ callbackUrl: input }) })) as { props: { callbackUrl: string } };
    expect(page.props.callbackUrl).toBe('/studies');
  });
});
