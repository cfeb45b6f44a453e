import { mailEnv } from '@/lib/server/env';

/**
 * An absolute link into the app for an e-mail. The base is NEXTAUTH_URL (the address people reach
 * the app at), so links work from a mail client outside the browser session.
 */
export function appLink(pathname: string): string {
  const base = mailEnv().NEXTAUTH_URL;
  return `${base}${pathname.startsWith('/') ? pathname : `/${pathname}`}`;
}
