// Where to go after signing in or up: only a path of this app. Browsers read many strings that
// start with "/" as another host: "//evil.example", "/\evil.example" (a backslash is a slash to the
// URL parser), "/\t/evil.example" (tabs and line breaks are dropped), and their percent-encoded
// forms once something decodes them. So a callback is refused unless, after URL parsing against a
// placeholder origin, it is still on that origin; and it is refused outright when it holds a
// backslash, a control or whitespace character, or decodes to any of these.

const PLACEHOLDER = 'http://callback.invalid';
const MAX_LENGTH = 2000;

function looksHostile(text: string): boolean {
  return /[\\\u0000-\u0020\u007f-\u00a0\u1680\u2000-\u200f\u2028\u2029\u202f\u205f\u3000\ufeff]/.test(text) || !text.startsWith('/') || text.startsWith('//');
}

function decodedOnce(text: string): string | null {
  try {
    return decodeURIComponent(text);
  } catch {
    return null;
  }
}

/**
 * The callback as a same-origin path (path, query and fragment), or `fallback` when it could lead
 * anywhere else (see the file comment).
 * @example safeCallbackPath('/studies/3?tab=team') === '/studies/3?tab=team'
 * @example safeCallbackPath('/\\evil.example') === '/studies'
 */
export function safeCallbackPath(raw: unknown, fallback = '/studies'): string {
  if (typeof raw !== 'string' || raw.length === 0 || raw.length > MAX_LENGTH) return fallback;
  const decoded = decodedOnce(raw);
  if (decoded === null || looksHostile(raw) || looksHostile(decoded)) return fallback;
  let url: URL;
  try {
    url = new URL(raw, PLACEHOLDER);
  } catch {
    return fallback;
  }
  if (url.origin !== PLACEHOLDER) return fallback;
  const path = `${url.pathname}${url.search}${url.hash}`;
  return path.startsWith('/') && !path.startsWith('//') ? path : fallback;
}

/**
 * next-auth's redirect rule: an absolute URL on this app's origin or a safe path; anything else
 * goes to the study list.
 */
export function safeRedirectUrl(url: string, baseUrl: string): string {
  const base = new URL(baseUrl);
  if (url.startsWith('/')) return `${base.origin}${safeCallbackPath(url)}`;
  try {
    const target = new URL(url);
    if (target.origin === base.origin) return `${base.origin}${safeCallbackPath(`${target.pathname}${target.search}${target.hash}`)}`;
  } catch {
    /* not a URL: fall through */
  }
  return `${base.origin}/studies`;
}
