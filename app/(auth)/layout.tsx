import type { ReactNode } from 'react';
import { Wordmark } from '@/components/layout/logo';

export default function AuthLayout({ children }: { children: ReactNode }) {
  return (
    <main className="flex min-h-screen flex-col items-center justify-center gap-6 px-4 py-12">
      <Wordmark />
      <div className="w-full max-w-sm rounded-xl border border-ink/10 bg-paper-raised p-6 shadow-sm">{children}</div>
      <p className="max-w-sm text-center text-xs text-ink-soft">
        Switchback plans intertemporal-choice studies. Its estimates describe hypothetical choices, not a clinical assessment of anyone.
      </p>
    </main>
  );
}
