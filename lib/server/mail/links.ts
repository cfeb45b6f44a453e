/**
 * An absolute link into the app for an e-mail. The base is NEXTAUTH_URL (the address people reach
 * the app at), so links work from a mail client outside the browser session.
 */
export function appLink(pathname: string): string {
  const base = (process.env.NEXTAUTH_URL || 'http://127.0.0.1:3000').replace(/\/+$/, '');
  return `${base}${pathname.startsWith('/') ? pathname : `/${pathname}`}`;
}
