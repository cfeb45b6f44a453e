'use client';

import { useMemo } from 'react';
import { buttonClass } from '@/components/ui/button';
import { Card } from '@/components/ui/card';
import { Table, Td, Th } from '@/components/ui/table';
import { analysisExportUrl, type AnalysisDto } from '@/lib/client/results';
import { patternsSvg, zonesSvg } from '@/lib/shared/figures/results-figures';
import { ROLE_LABELS, SOURCE_LABELS, type StoredAnalysis } from '@/lib/shared/results/stored-analysis';
import { formatDateTime } from '@/lib/shared/format';

const PATTERNS = ['LL', 'LS', 'SL', 'SS'] as const;
const RULE_LABELS: Record<string, string> = {
  attentionCheck: 'Failed attention check',
  flaggedEstimates: 'Flagged calibration estimates',
  incompleteBlocks: 'Incomplete blocks',
  responseTimeFloor: 'Response faster than the floor',
};

function pct(x: number, n: number) {
  return n > 0 ? `${((100 * x) / n).toFixed(1)} %` : '–';
}
function p(v: number) {
  return v < 0.001 ? '< 0.001' : v.toFixed(3);
}

/** Everything a saved analysis reports: figures, tables, tests, model comparison, zone diagnosis, paragraph and downloads. */
export function AnalysisView({ studyId, analysis }: { studyId: number; analysis: AnalysisDto & { result: StoredAnalysis } }) {
  const r = analysis.result;
  const alternative = r.comparison.bestByBic && r.comparison.bestByBic !== r.options.model.id ? r.comparison.bestByBic : r.options.model.id === 'hyperbolic' ? 'exponential' : 'hyperbolic';
  const caption = `${analysis.label} · design ${analysis.designVersion.hash.slice(0, 12)} · N = ${r.participantsAnalysed} · Estimates from hypothetical choices, not a clinical assessment of any person.`;
  const figures = useMemo(() => ({ patterns: patternsSvg(r.patterns, { alternative, caption }), zones: r.zones ? zonesSvg(r.zones, { caption }) : null }), [r, alternative, caption]);
  const sources = ['design', ...r.comparison.models.map((m) => m.model)];
  const download = (format: Parameters<typeof analysisExportUrl>[2], label: string) => (
    <a key={format} href={analysisExportUrl(studyId, analysis.id, format)} className={buttonClass('secondary', 'sm')} download>
      {label}
    </a>
  );
  return (
    <div className="space-y-6" data-testid="analysis-view">
      <Card title={`${analysis.label}`} actions={<span className="text-xs text-ink-soft">design {analysis.designVersion.name}, version {analysis.designVersion.number} · {analysis.designVersion.hash.slice(0, 12)}</span>}>
        <p className="text-sm">
          N = {r.participantsAnalysed} of {r.participantsTotal} participants after exclusions. {analysis.software}; saved {formatDateTime(analysis.createdAt)}
          {analysis.createdBy ? ` by ${analysis.createdBy}` : ''}.
        </p>
        <div className="mt-2 flex flex-wrap gap-2" data-testid="analysis-downloads">
          {download('csv', 'CSV')}
          {download('json', 'JSON')}
          {download('patterns.svg', 'Pattern chart (SVG)')}
          {download('patterns.png', 'Pattern chart (PNG)')}
          {r.zones ? download('zones.svg', 'Zone chart (SVG)') : null}
          {r.zones ? download('zones.png', 'Zone chart (PNG)') : null}
        </div>
      </Card>

      <Card title="Observed against expected choice patterns">
        <div data-testid="patterns-chart" className="w-full max-w-3xl [&>svg]:h-auto [&>svg]:w-full" dangerouslySetInnerHTML={{ __html: figures.patterns }} />
        <div className="mt-4 space-y-4">
          {r.patterns.map((row) => (
            <Table key={row.role} caption={`${ROLE_LABELS[row.role]}: observed and expected patterns`}>
              <thead>
                <tr>
                  <Th>{ROLE_LABELS[row.role]} ({row.pairs} pairs, {row.participants} participants)</Th>
                  {PATTERNS.map((pattern) => (
                    <Th key={pattern} className="text-right">
                      {pattern}
                    </Th>
                  ))}
                </tr>
              </thead>
              <tbody>
                <tr className="font-medium">
                  <Td>Observed</Td>
                  {PATTERNS.map((pattern) => (
                    <Td key={pattern} className="text-right">
                      {row.observed[pattern]} ({pct(row.observed[pattern], row.pairs)})
                    </Td>
                  ))}
                </tr>
                {sources.map((source) => (
                  <tr key={source}>
                    <Td>Expected: {SOURCE_LABELS[source]}</Td>
                    {PATTERNS.map((pattern) => {
                      const v = row.expected[source as keyof typeof row.expected][pattern];
                      return (
                        <Td key={pattern} className="text-right text-ink-soft">
                          {v.toFixed(1)} ({pct(v, row.pairs)})
                        </Td>
                      );
                    })}
                  </tr>
                ))}
              </tbody>
            </Table>
          ))}
        </div>
      </Card>

      <Card title="Tests">
        <Table caption="Reversal tests">
          <thead>
            <tr>
              <Th>Test</Th>
              <Th>Counts</Th>
              <Th className="text-right">p ({r.options.alternative === 'greater' ? 'one-sided' : 'two-sided'})</Th>
            </tr>
          </thead>
          <tbody>
            <tr>
              <Td>Primary: sign test on each participant&apos;s LS − SL among probes</Td>
              <Td>
                {r.tests.signTest.positive} more LS, {r.tests.signTest.negative} more SL, {r.tests.signTest.ties} ties
              </Td>
              <Td className="text-right">{p(r.tests.signTest.pValue)}</Td>
            </tr>
            <tr>
              <Td>Probes against anchors within person (sign test)</Td>
              <Td>
                {r.tests.probesVsAnchors.positive} higher, {r.tests.probesVsAnchors.negative} lower, {r.tests.probesVsAnchors.ties} ties
              </Td>
              <Td className="text-right">{p(r.tests.probesVsAnchors.pValue)}</Td>
            </tr>
            <tr>
              <Td>Secondary: pooled exact McNemar (assumes independent pairs)</Td>
              <Td>
                {r.tests.pooledMcNemar.ls} LS against {r.tests.pooledMcNemar.sl} SL
              </Td>
              <Td className="text-right">{p(r.tests.pooledMcNemar.pValue)}</Td>
            </tr>
          </tbody>
        </Table>
        <h3 className="mt-4 text-sm font-semibold">Exclusions</h3>
        <ul className="list-disc pl-5 text-sm">
          {r.exclusions.rules.map((rule) => (
            <li key={rule.rule}>
              {RULE_LABELS[rule.rule]}
              {rule.rule === 'responseTimeFloor' ? ` (${analysis.settings.exclusions.responseTimeFloor.ms} ms)` : ''}: {rule.enabled ? 'on' : 'off'} — applies to {rule.applies}, removed {rule.removes}
            </li>
          ))}
        </ul>
      </Card>

      <Card title="Model comparison">
        <Table caption="Models refitted to every participant">
          <thead>
            <tr>
              <Th>Model</Th>
              <Th className="text-right">Σ ln L</Th>
              <Th className="text-right">Σ AIC (Δ)</Th>
              <Th className="text-right">Σ BIC (Δ)</Th>
              <Th className="text-right">Best by BIC</Th>
              <Th className="text-right">Stage-2 log score per choice</Th>
            </tr>
          </thead>
          <tbody>
            {[...r.comparison.models]
              .sort((a, b) => a.bic - b.bic)
              .map((m) => (
                <tr key={m.model}>
                  <Td>{SOURCE_LABELS[m.model]}</Td>
                  <Td className="text-right">{m.logLikelihood.toFixed(1)}</Td>
                  <Td className="text-right">
                    {m.aic.toFixed(1)} ({m.deltaAic.toFixed(1)})
                  </Td>
                  <Td className="text-right">
                    {m.bic.toFixed(1)} ({m.deltaBic.toFixed(1)})
                  </Td>
                  <Td className="text-right">{m.bestByBic}</Td>
                  <Td className="text-right">{m.predictiveLogScorePerChoice === null ? '–' : m.predictiveLogScorePerChoice.toFixed(3)}</Td>
                </tr>
              ))}
          </tbody>
        </Table>
        <p className="mt-2 text-xs text-ink-soft">
          Fits use calibration and stage-2 choices; the log score predicts stage-2 choices from calibration-only fits (higher is better). Choice sensitivity γ ={' '}
          {r.options.choice.sensitivity} is held fixed.
        </p>
      </Card>

      {r.zones && figures.zones ? (
        <Card title="Where the zone really was">
          <div data-testid="zones-chart" className="w-full max-w-3xl [&>svg]:h-auto [&>svg]:w-full" dangerouslySetInnerHTML={{ __html: figures.zones }} />
          <ul className="mt-2 list-disc pl-5 text-sm" data-testid="zone-findings">
            {r.zones.findings.map((f) => (
              <li key={f}>{f}</li>
            ))}
          </ul>
        </Card>
      ) : null}

      <Card title="Results paragraph">
        <p className="text-sm leading-relaxed" data-testid="results-paragraph">
          {analysis.paragraph}
        </p>
      </Card>
    </div>
  );
}
