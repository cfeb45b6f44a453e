'use client';

import { Button } from '@/components/ui/button';
import { Notice } from '@/components/ui/notice';

/** Shown inside the workspace shell when a page fails to render; the header stays usable. */
export default function WorkspaceError({ error, reset }: { error: Error & { digest?: string }; reset: () => void }) {
  return (
    <div className="mx-auto max-w-xl space-y-4">
      <Notice tone="error" title="This page could not be shown">
        If Switchback&apos;s database was briefly unavailable, trying again usually works.
        {error.digest ? <span className="mt-1 block font-mono text-xs">Reference {error.digest}</span> : null}
      </Notice>
      <Button onClick={reset}>Try again</Button>
    </div>
  );
}
