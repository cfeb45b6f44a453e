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
        <div className="mx-auto flex max-w-6xl items-center justify-between gap-4 px-6 py-3">
          <Link href="/studies" aria-label="Switchback, your studies">
            <Wordmark />
          </Link>
          <div className="flex items-center gap-4 text-sm">
            <WorkspaceLinks />
            <span className="text-ink-soft" data-testid="current-user">
              {user.name || user.email}
            </span>
            <SignOutButton />
          </div>
        </div>
      </header>
      <main className="mx-auto w-full max-w-6xl flex-1 px-6 py-8">{children}</main>
      <CautionFooter />
    </div>
  );
}
