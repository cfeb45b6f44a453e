import { scaleBand, scaleLinear, scaleLog } from 'd3-scale';
import { FIGURE } from './power-curve';
import { ROLE_LABELS, SOURCE_LABELS } from '@/lib/shared/results/stored-analysis';
import type { RolePatterns, ZoneDiagnosis } from '@/lib/design';

const PATTERNS = ['LL', 'LS', 'SL', 'SS'] as const;
const COLOURS: Record<string, string> = { observed: '#0f172a', design: '#0f766e', alternative: '#b45309' };
const MARGIN = { top: 44, right: 24, bottom: 86, left: 58 };

function escapeXml(text: string): string {
  return text.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;').replace(/"/g, '&quot;');
}

function frame(title: string, body: string[], caption: string): string {
  const { width, height } = FIGURE;
  return [
    `<svg xmlns="http://www.w3.org/2000/svg" width="${width}" height="${height}" viewBox="0 0 ${width} ${height}" font-family="Source Sans 3, sans-serif" role="img" aria-label="${escapeXml(title)}">`,
    `<rect width="${width}" height="${height}" fill="#ffffff"/>`,
    `<text x="${MARGIN.left}" y="24" font-size="15" font-weight="600" fill="#0f172a">${escapeXml(title)}</text>`,
    ...body,
    `<text x="${MARGIN.left}" y="${height - 10}" font-size="10" fill="#475569">${escapeXml(caption)}</text>`,
    '</svg>',
  ].join('\n');
}

/**
 * Observed against expected choice patterns as a grouped bar chart: for each pair role, the
 * shares of LL, LS, SL and SS among answered pairs, observed beside the expectation under the
 * design's model and one alternative model. d3 computes the scales; the same SVG text is shown
 * on the results page, downloaded, and rendered to PNG.
 */
export function patternsSvg(patterns: readonly RolePatterns[], options: { alternative: string; caption: string }): string {
  const { width, height } = FIGURE;
  const innerH = height - MARGIN.top - MARGIN.bottom;
  const series = ['observed', 'design', options.alternative];
  const roles = patterns.map((p) => p.role);
  const outer = scaleBand().domain(roles).range([MARGIN.left, width - MARGIN.right]).paddingInner(0.12);
  const inner = scaleBand<string>().domain([...PATTERNS]).range([0, outer.bandwidth()]).paddingInner(0.18);
  const bar = scaleBand<string>().domain(series).range([0, inner.bandwidth()]).paddingInner(0.08);
  const y = scaleLinear().domain([0, 1]).range([MARGIN.top + innerH, MARGIN.top]);
  const body: string[] = [];
  for (const tick of y.ticks(5)) {
    body.push(`<line x1="${MARGIN.left}" x2="${width - MARGIN.right}" y1="${y(tick)}" y2="${y(tick)}" stroke="#e2e8f0"/>`);
    body.push(`<text x="${MARGIN.left - 6}" y="${y(tick) + 4}" font-size="10" text-anchor="end" fill="#475569">${Math.round(tick * 100)} %</text>`);
  }
  body.push(`<text transform="translate(14 ${MARGIN.top + innerH / 2}) rotate(-90)" font-size="11" text-anchor="middle" fill="#334155">Share of answered pairs</text>`);
  for (const row of patterns) {
    const x0 = outer(row.role)!;
    body.push(`<text x="${x0 + outer.bandwidth() / 2}" y="${MARGIN.top + innerH + 30}" font-size="11" font-weight="600" text-anchor="middle" fill="#0f172a">${escapeXml(`${ROLE_LABELS[row.role]} (${row.pairs} pairs)`)}</text>`);
    for (const pattern of PATTERNS) {
      const x1 = x0 + inner(pattern)!;
      body.push(`<text x="${x1 + inner.bandwidth() / 2}" y="${MARGIN.top + innerH + 14}" font-size="10" text-anchor="middle" fill="#334155">${pattern}</text>`);
      series.forEach((source) => {
        const count = source === 'observed' ? row.observed[pattern] : (row.expected[source as keyof typeof row.expected]?.[pattern] ?? 0);
        const share = row.pairs > 0 ? count / row.pairs : 0;
        const colour = source === 'observed' ? COLOURS.observed : source === 'design' ? COLOURS.design : COLOURS.alternative;
        const x = x1 + bar(source)!;
        body.push(`<rect x="${x.toFixed(2)}" y="${y(share).toFixed(2)}" width="${bar.bandwidth().toFixed(2)}" height="${(y(0) - y(share)).toFixed(2)}" fill="${colour}"><title>${escapeXml(`${ROLE_LABELS[row.role]}, ${pattern}, ${SOURCE_LABELS[source] ?? source}: ${(share * 100).toFixed(1)} %`)}</title></rect>`);
      });
    }
  }
  body.push(`<line x1="${MARGIN.left}" x2="${width - MARGIN.right}" y1="${y(0)}" y2="${y(0)}" stroke="#334155"/>`);
  let lx = MARGIN.left;
  for (const source of series) {
    const colour = source === 'observed' ? COLOURS.observed : source === 'design' ? COLOURS.design : COLOURS.alternative;
    const label = source === 'observed' ? 'Observed' : source === 'design' ? 'Expected: design model' : `Expected: ${SOURCE_LABELS[source] ?? source}`;
    body.push(`<rect x="${lx}" y="${height - 38}" width="10" height="10" fill="${colour}"/><text x="${lx + 14}" y="${height - 29}" font-size="10" fill="#334155">${escapeXml(label)}</text>`);
    lx += 24 + label.length * 5.2;
  }
  return frame('Choice patterns by pair role: observed and expected', body, options.caption);
}

/**
 * The zone diagnosis on one chart: each participant a row, their refitted reversal zone a bar on
 * a logarithmic late-delay axis, each probe a dot coloured by where it fell (before, inside,
 * after the zone). Participants are sorted by the zone's lower bound; at most `limit` are drawn.
 */
export function zonesSvg(zones: ZoneDiagnosis, options: { caption: string; limit?: number }): string {
  const { width, height } = FIGURE;
  const people = [...zones.participants].sort((a, b) => (a.zone?.lower ?? Infinity) - (b.zone?.lower ?? Infinity)).slice(0, options.limit ?? 60);
  const delays = people.flatMap((p) => [...p.probes.map((q) => q.lateDelay), ...(p.zone ? [p.zone.lower, Math.min(p.zone.upper, 1e5)] : [])]).filter((v) => v > 0 && Number.isFinite(v));
  const lo = Math.max(1, Math.min(...delays, 10) / 1.5);
  const hi = Math.max(...delays, 100) * 1.5;
  const x = scaleLog().domain([lo, hi]).range([MARGIN.left + 40, width - MARGIN.right]).clamp(true);
  const y = scaleBand<string>().domain(people.map((p) => p.participantId)).range([MARGIN.top, height - MARGIN.bottom]).paddingInner(0.25);
  const colour = { before: '#2563eb', inside: '#0f766e', after: '#be123c', 'no-zone': '#64748b' } as const;
  const body: string[] = [];
  for (const tick of x.ticks(6).filter((t) => [1, 10, 100, 1000, 10000, 3, 30, 300, 3000].includes(t))) {
    body.push(`<line x1="${x(tick)}" x2="${x(tick)}" y1="${MARGIN.top}" y2="${height - MARGIN.bottom}" stroke="#e2e8f0"/>`);
    body.push(`<text x="${x(tick)}" y="${height - MARGIN.bottom + 14}" font-size="10" text-anchor="middle" fill="#475569">${tick}</text>`);
  }
  body.push(`<text x="${(MARGIN.left + width) / 2}" y="${height - MARGIN.bottom + 30}" font-size="11" text-anchor="middle" fill="#334155">Late delay D of the probe pair (days, logarithmic)</text>`);
  body.push(`<text transform="translate(14 ${(MARGIN.top + height - MARGIN.bottom) / 2}) rotate(-90)" font-size="11" text-anchor="middle" fill="#334155">Participants</text>`);
  const band = y.bandwidth();
  for (const p of people) {
    const cy = y(p.participantId)! + band / 2;
    if (p.zone) {
      const x1 = x(Math.max(lo, p.zone.lower));
      const x2 = x(Math.min(hi, p.zone.upper));
      body.push(`<rect x="${x1.toFixed(2)}" y="${(cy - band / 2).toFixed(2)}" width="${Math.max(1, x2 - x1).toFixed(2)}" height="${band.toFixed(2)}" fill="#99f6e4"><title>${escapeXml(`${p.participantId}: zone ${Math.round(p.zone.lower)} to ${Number.isFinite(p.zone.upper) ? Math.round(p.zone.upper) : '∞'} days`)}</title></rect>`);
    }
    for (const q of p.probes) {
      body.push(`<circle cx="${x(q.lateDelay).toFixed(2)}" cy="${cy.toFixed(2)}" r="${Math.max(1.5, Math.min(3.5, band / 2)).toFixed(2)}" fill="${colour[q.position]}"><title>${escapeXml(`${p.participantId}: probe at ${q.lateDelay} days, ${q.position}`)}</title></circle>`);
    }
  }
  let lx = MARGIN.left;
  for (const [key, label] of [['inside', 'Probe inside the zone'], ['before', 'Probe before'], ['after', 'Probe after'], ['no-zone', 'No zone']] as const) {
    body.push(`<circle cx="${lx + 5}" cy="${height - 33}" r="4" fill="${colour[key]}"/><text x="${lx + 13}" y="${height - 29}" font-size="10" fill="#334155">${label}</text>`);
    lx += 30 + label.length * 5.2;
  }
  body.push(`<rect x="${lx}" y="${height - 38}" width="14" height="10" fill="#99f6e4"/><text x="${lx + 18}" y="${height - 29}" font-size="10" fill="#334155">Refitted reversal zone</text>`);
  const model = SOURCE_LABELS[zones.model] ?? zones.model;
  return frame(`Where the reversal zone really was (refitted ${model.toLowerCase()} model)`, body, options.caption);
}
