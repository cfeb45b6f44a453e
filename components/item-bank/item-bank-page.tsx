'use client';

import { useState } from 'react';
import { buttonClass } from '@/components/ui/button';
import { Card } from '@/components/ui/card';
import { SelectField, TextField } from '@/components/ui/field';
import { Notice } from '@/components/ui/notice';
import { QueryState } from '@/components/ui/query-state';
import { useStudyContext } from '@/components/studies/study-context';
import { exportQuery, useFrozenVersions, useItemBankPreview } from '@/lib/client/item-bank';
import type { ExportOptions } from '@/lib/shared/validations/item-bank';
import { ItemTable } from './item-table';
import { RoundingReport } from './rounding-report';
import { VersionSelect } from './version-select';

/** The item-bank page: pick a frozen version and presentation options, check the items and rounding, download CSV or JSON. */
export function ItemBankPage() {
  const { study, can } = useStudyContext();
  const versions = useFrozenVersions(study.id);
  const [picked, setPicked] = useState<number | null>(null);
  const [seed, setSeed] = useState('');
  const [delayUnit, setDelayUnit] = useState<ExportOptions['delayUnit']>('days');
  const [minGap, setMinGap] = useState(2);
  const versionId = picked ?? versions.data?.[0]?.id ?? null;
  const options = { delayUnit, minGap, ...(/^\d+$/.test(seed) ? { seed: Number(seed) } : {}) };
  const preview = useItemBankPreview(study.id, versionId, options);
  if (!can('operator')) return <Notice tone="warning" title="Operators and above">Exporting the item bank needs the operator role or higher.</Notice>;
  const href = (format: ExportOptions['format']) => `/api/studies/${study.id}/item-bank/${versionId}/export?${exportQuery({ ...options, format })}`;
  return (
    <div className="space-y-6">
      <QueryState query={versions} label="Loading frozen versions…">
        {versions.data && versions.data.length === 0 ? (
          <Notice title="No frozen design yet">Freeze a design on the Designs page first; the item bank is always built from a frozen version, so an export cites its hash.</Notice>
        ) : (
          <Card title="Export the item bank">
            <div className="grid gap-4 md:grid-cols-4">
              <div className="md:col-span-2">
                <VersionSelect versions={versions.data ?? []} value={versionId} onChange={setPicked} />
              </div>
              <SelectField label="Delays in" value={delayUnit} onChange={(e) => setDelayUnit(e.target.value as ExportOptions['delayUnit'])}>
                <option value="days">days</option>
                <option value="weeks">weeks (rounded to whole weeks)</option>
                <option value="months">months of 30 days</option>
              </SelectField>
              <TextField label="Seed (order and sides)" inputMode="numeric" placeholder={preview.data ? String(preview.data.header.seed) : 'from the hash'} value={seed} onChange={(e) => setSeed(e.target.value.replace(/\D/g, ''))} hint="Empty: taken from the design hash, so the export is reproducible." />
              <TextField label="Least items between a pair's two views" type="number" min={1} max={20} value={minGap} onChange={(e) => setMinGap(Math.min(20, Math.max(1, Number(e.target.value) || 1)))} />
            </div>
            <div className="mt-4 flex flex-wrap gap-3">
              <a className={buttonClass('primary')} href={href('csv')} download data-testid="download-csv">
                Download CSV
              </a>
              <a className={buttonClass('secondary')} href={href('metadata')} download data-testid="download-metadata">
                Its metadata (JSON)
              </a>
              <a className={buttonClass('secondary')} href={href('json')} download data-testid="download-json">
                Items and metadata in one JSON
              </a>
              <a className={buttonClass('ghost')} href={href('csv-annotated')} download data-testid="download-csv-annotated">
                CSV with “#” comment lines
              </a>
            </div>
            <p className="mt-2 text-xs text-ink-soft">
              The CSV is plain: one header row, then one row per item, ready for spreadsheets and survey tools. The study, design version, hash, seed, units and column
              meanings are in its metadata file (or in the single JSON); keep them beside the CSV.
            </p>
            <p className="mt-2 text-xs text-ink-soft">Each download is recorded in the study&apos;s audit trail. CSV cells that a spreadsheet could run as a formula are prefixed with an apostrophe.</p>
          </Card>
        )}
      </QueryState>
      {versionId !== null ? (
        <QueryState query={preview} label="Building the item bank…">
          {preview.data ? (
            <div className="space-y-6">
              <p className="text-sm text-ink-soft" data-testid="bank-header">
                Design {preview.data.header.designVersion.name} v{preview.data.header.designVersion.number} · hash <span className="font-mono">{preview.data.header.designVersion.hash.slice(0, 16)}…</span> · seed {preview.data.header.seed} · amounts rounded to {preview.data.header.amountUnit} {preview.data.header.currency} · item bank{' '}
                <span className="font-mono" title="An API key with the same delay unit, gap and seed shows the same id; send it with calibration answers.">{preview.data.header.itemBankId}</span>
              </p>
              {preview.data.extrapolation ? <Notice tone="warning" title="Probe delays beyond the calibration range">{preview.data.extrapolation.message}</Notice> : null}
              {preview.data.extrapolationRisk ? (
                <Notice tone={preview.data.extrapolationRisk.outside > 0.5 ? 'warning' : 'info'} title="If delay sensitivity is below 1">
                  <span data-testid="extrapolation-risk">{preview.data.extrapolationRisk.message}</span>
                </Notice>
              ) : null}
              {preview.data.notes.map((n) => (
                <Notice key={n} tone="warning">
                  {n}
                </Notice>
              ))}
              {preview.data.probeRule ? <Notice title="Personalised design">{preview.data.probeRule}</Notice> : null}
              <Card title="Calibration block">
                <ItemTable items={preview.data.items.filter((i) => i.block === 'calibration')} caption="Calibration block items" />
              </Card>
              <Card title={preview.data.probeRule ? 'Probe block: fallback set' : 'Probe block'}>
                <ItemTable items={preview.data.items.filter((i) => i.block === 'probe')} caption="Probe block items" />
              </Card>
              <Card title="Rounding check">
                <RoundingReport report={preview.data.rounding} />
              </Card>
            </div>
          ) : null}
        </QueryState>
      ) : null}
    </div>
  );
}
