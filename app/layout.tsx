import type { Metadata } from 'next';
import type { ReactNode } from 'react';
import { Providers } from '@/components/layout/providers';
import { mono, sans } from './fonts';
import './globals.css';

export const metadata: Metadata = {
  title: { default: 'Switchback', template: '%s · Switchback' },
  description: 'Plan delay-discounting question sets that land each participant in their preference-reversal zone.',
};

export default function RootLayout({ children }: { children: ReactNode }) {
  return (
    <html lang="en" className={`${sans.variable} ${mono.variable}`}>
      <body className="min-h-screen">
        <Providers>{children}</Providers>
      </body>
    </html>
  );
}
