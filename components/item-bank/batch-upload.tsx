'use client';

import { useState } from 'react';
import { Button } from '@/components/ui/button';
import { Notice } from '@/components/ui/notice';
import { useServeBatch, type BatchResultDto, type FrozenVersionDto } from '@/lib/client/item-bank';
import { VersionSelect } from './version-select';

/** Batch mode: a CSV of offline calibration answers in, personalised item sets out (shown, and downloadable as JSON). */
export function BatchUpload({ studyId, versions }: { studyId: number; versions: FrozenVersionDto[] }) {
  const serve = useServeBatch(studyId);
  const [versionId, setVersionId] = useState<number>(versions[0].id);
  const [file, setFile] = useState<File | null>(null);
  const [results, setResults] = useState<BatchResultDto[] | null>(null);
  const run = async () => {
    if (!file) return;
    setResults(await serve.mutateAsync({ designVersionId: versionId, csv: await file.text() }).catch(() => null));
  };
  const served = results?.filter((r) => r.status === 'served').length ?? 0;
  const download = results ? URL.createObjectURL(new Blob([JSON.stringify(results, null, 2)], { type: 'application/json' })) : null;
  return (
    <div className="space-y-4">
      <p className="text-sm text-ink-soft">
        One row per participant: a <code>participantId</code> column and one column per calibration item id from the export, each <code>sooner</code> or <code>later</code>.
        Rows are served exactly as the API would (a participant already served with other answers is refused).
      </p>
      <div className="grid gap-4 md:grid-cols-2">
        <VersionSelect versions={versions} value={versionId} onChange={setVersionId} />
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
          {download ? (
            <a className="underline" href={download} download="switchback-batch-results.json">
              Download the item sets (JSON)
            </a>
          ) : null}
        </Notice>
      ) : null}
    </div>
  );
}
