import Link from 'next/link';
import { redirect } from 'next/navigation';
import type { ReactNode } from 'react';
import { Wordmark } from '@/components/layout/logo';
import { SignOutButton } from '@/components/auth/sign-out-button';
import { CautionFooter } from '@/components/layout/caution-footer';
import { WorkspaceLinks } from '@/components/mail/workspace-links';
import { getPageUser } from '@/lib/server/auth/session';

export default async function WorkspaceLayout({ children }: { children: ReactNode }) {
  const user = await getPageUser();
  if (!user) redirect('/sign-in');
  return (
    <div className="flex min-h-screen flex-col">
      <header className="border-b border-ink/10 bg-paper-raised">
        {/* Wraps at phone width instead of pushing "Sign out" off the screen. */}
        <div className="mx-auto flex max-w-6xl flex-wrap items-center justify-between gap-x-4 gap-y-2 px-4 py-3 sm:px-6">
          <Link href="/studies" aria-label="Switchback, your studies">
            <Wordmark />
          </Link>
          <div className="flex min-w-0 flex-wrap items-center gap-x-4 gap-y-2 text-sm">
            <Link href="/glossary" className="text-ink-soft hover:text-ink" data-testid="glossary-link">
              Methods &amp; glossary
            </Link>
            <WorkspaceLinks />
            <span className="hidden max-w-[14rem] truncate text-ink-soft sm:inline" data-testid="current-user" title={user.email}>
              {user.name || user.email}
            </span>
            <SignOutButton />
          </div>
        </div>
      </header>
      <main className="mx-auto w-full min-w-0 max-w-6xl flex-1 px-4 py-8 sm:px-6">{children}</main>
      <CautionFooter />
    </div>
  );
}
