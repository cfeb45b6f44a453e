'use client';

import { Button } from '@/components/ui/button';

export default function RootError({ error, reset }: { error: Error & { digest?: string }; reset: () => void }) {
  return (
    <main className="mx-auto max-w-md space-y-4 px-6 py-24 text-center">
      <h1>Something went wrong</h1>
      <p className="text-ink-soft">
        The page could not be shown. If the database was unavailable it may be back already.
        {error.digest ? <span className="block font-mono text-xs">Reference {error.digest}</span> : null}
      </p>
      <Button onClick={reset}>Try again</Button>
    </main>
  );
}
