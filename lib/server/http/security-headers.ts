// The security headers of every reply, in one place: proxy.ts sets them on pages and API replies
// served by Next, and the node:http path of scripts/serve.mjs (the probe-items endpoint, and paths
// refused before Next) sets them on its own replies.

/** Headers that every reply carries, whatever its type. */
export function baseSecurityHeaders(options: { https: boolean }): Record<string, string> {
  return {
    // A download is what its Content-Type says, never sniffed into HTML or script.
    'X-Content-Type-Options': 'nosniff',
    // Links out of the app send no path: reset and invitation pages carry tokens in their URL.
    // ("no-referrer" would also blank the Origin of the app's own POSTs, which the server checks.)
    'Referrer-Policy': 'same-origin',
    // For browsers older than CSP's frame-ancestors: no page of the app inside another's frame.
    'X-Frame-Options': 'DENY',
    ...(options.https ? { 'Strict-Transport-Security': 'max-age=31536000' } : {}),
  };
}

/**
 * The Content-Security-Policy of a page. Scripts run only from this origin with the request's
 * nonce (Next puts the nonce on its own scripts when it reads this policy from the request);
 * 'strict-dynamic' lets those scripts load the page's chunks. Styles may be inline: React and d3
 * write style attributes, and a style cannot run code. No other origin may frame a page.
 * `next dev` needs 'unsafe-eval' (React rebuilds error stacks with eval) and its websocket.
 */
export function pagePolicy(nonce: string, options: { dev: boolean; https: boolean }): string {
  return [
    "default-src 'self'",
    `script-src 'self' 'nonce-${nonce}' 'strict-dynamic'${options.dev ? " 'unsafe-eval'" : ''}`,
    "style-src 'self' 'unsafe-inline'",
    "img-src 'self' blob: data:",
    "font-src 'self' data:",
    `connect-src 'self'${options.dev ? ' ws: wss:' : ''}`,
    "worker-src 'self' blob:",
    "object-src 'none'",
    "base-uri 'self'",
    "form-action 'self'",
    "frame-ancestors 'none'",
    ...(options.https ? ['upgrade-insecure-requests'] : []),
  ].join('; ');
}

/** The policy of a reply that is data, not a page (JSON, CSV, figures): it loads nothing and is never framed. */
export const DATA_POLICY = "default-src 'none'; frame-ancestors 'none'";

/** Every security header of a data reply (API JSON, downloads) on the node:http path. */
export function dataReplyHeaders(options: { https: boolean }): Record<string, string> {
  return { ...baseSecurityHeaders(options), 'Content-Security-Policy': DATA_POLICY };
}

/** Whether a request reached us over https (directly, or as a TLS-terminating proxy says). */
export function isHttps(protocol: string | undefined, forwardedProto: string | null | undefined): boolean {
  return protocol === 'https:' || (forwardedProto ?? '').split(',')[0]!.trim().toLowerCase() === 'https';
}

/**
 * Whether a URL path holds a malformed percent-escape ("%E0%A4%A", "%zz"), which no route can
 * decode: such requests get 400 before routing rather than failing deep inside.
 */
export function hasMalformedEscape(pathname: string): boolean {
  try {
    decodeURIComponent(pathname);
    return false;
  } catch {
    return true;
  }
}

export const MALFORMED_PATH_MESSAGE = 'The address holds a malformed percent-escape (such as "%zz"), so it cannot be read.';
