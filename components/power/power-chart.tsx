'use client';

import { useMemo } from 'react';
import { powerCurveSvg, type PowerSeries } from '@/lib/shared/figures/power-curve';

/**
 * The power curve(s) with Wilson bands, drawn by the same d3 code that renders the SVG and PNG
 * downloads, so the page and the figure a grant uses always match.
 */
export function PowerChart({ series, title, caption, notes }: { series: PowerSeries[]; title?: string; caption?: string; notes?: string[] }) {
  const svg = useMemo(() => powerCurveSvg(series, { title, caption, notes }), [series, title, caption, notes]);
  // font-sans: the page's own copy of Source Sans 3 (next/font gives it another family name than the figure asks for)
  return <div data-testid="power-chart" className="w-full max-w-3xl [&>svg]:h-auto [&>svg]:w-full [&>svg]:font-sans" dangerouslySetInnerHTML={{ __html: svg }} />;
}
