'use client';

import { useMemo } from 'react';
import { drawLineChart } from '@/components/charts/draw-line-chart';
import { D3Chart } from '@/components/charts/d3-chart';
import type { DesignSummary } from '@/lib/shared/planner/types';
import { gapChartSpec, valueChartSpec } from './design-charts-spec';
import { TermHelp } from '@/components/glossary/term-help';

/** The two live charts of the design page. */
export function DesignCharts({ summary, currency }: { summary: DesignSummary; currency: string }) {
  const value = useMemo(() => valueChartSpec(summary, currency), [summary, currency]);
  const gap = useMemo(() => gapChartSpec(summary), [summary]);
  return (
    <div className="grid gap-4">
      <div>
        <h3 className="text-sm font-semibold">
          Value over time (typical participant, probe pair) against the <TermHelp id="standing-day">standing day</TermHelp>, from the{' '}
          <TermHelp id="far-near-view">far view to the near view</TermHelp>
        </h3>
        {value ? <D3Chart draw={drawLineChart} spec={value} testId="value-chart" /> : <p className="text-sm text-ink-soft">No probe pair to draw: the soon delay is 0 or there is no late delay after it.</p>}
      </div>
      <div>
        <h3 className="text-sm font-semibold">
          <TermHelp id="gap-product">Gap product</TermHelp> against late delay
        </h3>
        {gap ? <D3Chart draw={drawLineChart} spec={gap} testId="gap-chart" /> : <p className="text-sm text-ink-soft">The typical participant has no reversal zone, so there is no gap product to draw.</p>}
      </div>
    </div>
  );
}
