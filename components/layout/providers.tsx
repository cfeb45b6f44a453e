'use client';

import { QueryClient, QueryClientProvider } from '@tanstack/react-query';
import { useState, type ReactNode } from 'react';
import { z } from 'zod';
import { shouldRetry } from '@/lib/client/api';

// zod compiles fast parsers with `new Function` when it may; under the content security policy
// (no 'unsafe-eval') its probe would be reported as a violation on every page, so it parses
// without compiling in the browser.
z.config({ jitless: true });

export function Providers({ children }: { children: ReactNode }) {
  const [client] = useState(
    () =>
      new QueryClient({
        defaultOptions: {
          queries: { retry: shouldRetry, retryDelay: (n) => Math.min(1000 * 2 ** n, 5000), staleTime: 10_000 },
          mutations: { retry: false },
        },
      }),
  );
  return <QueryClientProvider client={client}>{children}</QueryClientProvider>;
}
