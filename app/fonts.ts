import localFont from 'next/font/local';

// Shipped in fonts/ (copied once from the @fontsource packages, OFL-licensed): the app never fetches fonts at run time.
export const sans = localFont({
  src: [
    { path: '../fonts/source-sans-3-latin-400-normal.woff2', weight: '400', style: 'normal' },
    { path: '../fonts/source-sans-3-latin-600-normal.woff2', weight: '600', style: 'normal' },
    { path: '../fonts/source-sans-3-latin-700-normal.woff2', weight: '700', style: 'normal' },
  ],
  variable: '--font-sans',
  display: 'swap',
});

export const mono = localFont({
  src: [
    { path: '../fonts/ibm-plex-mono-latin-400-normal.woff2', weight: '400', style: 'normal' },
    { path: '../fonts/ibm-plex-mono-latin-500-normal.woff2', weight: '500', style: 'normal' },
  ],
  variable: '--font-mono',
  display: 'swap',
});
