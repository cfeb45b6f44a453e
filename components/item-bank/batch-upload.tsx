'use client';

import { toCsv } from '@/lib/shared/csv';
import { useState } from 'react';
import { Button } from '@/components/ui/button';
import { Notice } from '@/components/ui/notice';
import { fetchBatchCsv, useItemBankPreview, useServeBatch, type BatchResultDto, type FrozenVersionDto } from '@/lib/client/item-bank';
import { VersionSelect } from './version-select';

/** Starts a download of text made in the browser. */
function saveText(text: string, filename: string, type: string) {
  const url = URL.createObjectURL(new Blob([text], { type }));
  const link = document.createElement('a');
  link.href = url;
  link.download = filename;
  link.click();
  setTimeout(() => URL.revokeObjectURL(url), 10_000);
}

/**
 * Batch mode: a CSV of offline calibration answers in, personalised item sets out (shown, and
 * downloadable as CSV or JSON). An empty answer sheet with the version's calibration item ids
 * as columns is offered first, so the file matches the bank the lab ran.
 */
export function BatchUpload({ studyId, versions }: { studyId: number; versions: FrozenVersionDto[] }) {
  const serve = useServeBatch(studyId);
  const [versionId, setVersionId] = useState<number>(versions[0].id);
  const preview = useItemBankPreview(studyId, versionId, {});
  const [file, setFile] = useState<File | null>(null);
  const [sent, setSent] = useState<{ designVersionId: number; csv: string } | null>(null);
  const [results, setResults] = useState<BatchResultDto[] | null>(null);
  const [csvError, setCsvError] = useState<string | null>(null);
  const version = versions.find((v) => v.id === versionId);
  const calibrationIds = preview.data?.items.filter((i) => i.block === 'calibration').map((i) => i.id) ?? [];

  const run = async () => {
    if (!file) return;
    const input = { designVersionId: versionId, csv: await file.text() };
    setCsvError(null);
    try {
      setResults(await serve.mutateAsync(input));
      setSent(input);
    } catch {
      setResults(null); // serve.error says why
    }
  };
  // the file names carry the study and the version's hash, as the item-bank exports do
  const stem = `${studyId}-${version?.hash.slice(0, 12) ?? versionId}`;
  const downloadSheet = () => {
    saveText(toCsv({ columns: ['participantId', ...calibrationIds], rows: [] }), `switchback-answer-sheet-${stem}.csv`, 'text/csv');
  };
  const downloadCsv = async () => {
    if (!sent) return;
    setCsvError(null);
    try {
      saveText(await fetchBatchCsv(studyId, sent), `switchback-batch-${stem}.csv`, 'text/csv');
    } catch (error) {
      setCsvError(error instanceof Error ? error.message : 'The CSV could not be made.');
    }
  };
  const served = results?.filter((r) => r.status === 'served').length ?? 0;
  return (
    <div className="space-y-4">
      <p className="text-sm text-ink-soft">
        One row per participant: a <code>participantId</code> column and one column per calibration item id from the export, each <code>sooner</code> or <code>later</code>.
        Rows are served exactly as the API would (a participant already served with other answers is refused).
      </p>
      <div className="grid gap-4 md:grid-cols-2">
        <div className="space-y-2">
          <VersionSelect
            versions={versions}
            value={versionId}
            onChange={(id) => {
              setVersionId(id);
              setResults(null);
              setSent(null);
            }}
          />
          <Button variant="secondary" onClick={downloadSheet} disabled={calibrationIds.length === 0} data-testid="answer-sheet">
            Download an empty answer sheet
          </Button>
        </div>
        <label className="block space-y-1 text-sm font-medium text-ink">
          <span>Answers (CSV)</span>
          <input type="file" accept=".csv,text/csv" onChange={(e) => setFile(e.target.files?.[0] ?? null)} className="block w-full text-sm" data-testid="batch-file" />
        </label>
      </div>
      <Button onClick={run} disabled={!file || serve.isPending}>
        {serve.isPending ? 'Serving…' : 'Serve participants'}
      </Button>
      {serve.error ? <Notice tone="error">{serve.error.message}</Notice> : null}
      {results ? (
        <Notice tone={served === results.length ? 'info' : 'warning'} title={`${served} of ${results.length} participants served`}>
          <ul className="list-disc pl-5">
            {results
              .filter((r) => r.status === 'refused')
              .map((r) => (
                <li key={r.line}>
                  Line {r.line} ({r.participantId || 'no id'}): {r.status === 'refused' ? r.message : ''}
                </li>
              ))}
          </ul>
          <div className="mt-2 flex flex-wrap gap-3">
            <Button variant="secondary" onClick={downloadCsv} data-testid="batch-csv">
              Download the item sets (CSV)
            </Button>
            <Button variant="secondary" onClick={() => saveText(JSON.stringify(results, null, 2), `switchback-batch-${stem}.json`, 'application/json')}>
              Download the item sets (JSON)
            </Button>
          </div>
          {csvError ? <p role="alert" className="mt-2 text-danger-700">{csvError}</p> : null}
        </Notice>
      ) : null}
    </div>
  );
}
