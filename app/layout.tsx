import type { Metadata } from 'next';
import { headers } from 'next/headers';
import type { ReactNode } from 'react';
import { Providers } from '@/components/layout/providers';
import { mono, sans } from './fonts';
import './globals.css';

export const metadata: Metadata = {
  title: { default: 'Switchback', template: '%s · Switchback' },
  description: 'Plan delay-discounting question sets that land each participant in their preference-reversal zone.',
};

export default async function RootLayout({ children }: { children: ReactNode }) {
  // Every page renders per request, so each gets the fresh script nonce proxy.ts put in the
  // request's Content-Security-Policy (a page prerendered at build time would carry none).
  await headers();
  return (
    <html lang="en" className={`${sans.variable} ${mono.variable}`}>
      <body className="min-h-screen">
        <Providers>{children}</Providers>
      </body>
    </html>
  );
}
