'use client';

import { useState } from 'react';
import { Notice, ProblemNotice, type Problem } from '@/components/ui/notice';
import { ApiClientError } from '@/lib/client/api';
import { useUploadChoices, type UploadReport } from '@/lib/client/results';
import { CHOICES_MAX_BYTES } from '@/lib/shared/results/choices-csv';

/** Upload observed stage-2 choices (long format CSV); the report says what was recorded, or every problem with its line. */
export function UploadChoices({ studyId }: { studyId: number }) {
  const upload = useUploadChoices(studyId);
  const [problem, setProblem] = useState<Problem | null>(null);
  const [report, setReport] = useState<(UploadReport & { file: string }) | null>(null);

  async function onFile(file: File | undefined) {
    setProblem(null);
    setReport(null);
    if (!file) return;
    if (file.size > CHOICES_MAX_BYTES) {
      setProblem({ message: `“${file.name}” is larger than 5 MB; upload at most 100,000 rows, or split it by participant.`, issues: [] });
      return;
    }
    try {
      setReport({ ...(await upload.mutateAsync(await file.text())), file: file.name });
    } catch (error) {
      if (error instanceof ApiClientError) setProblem({ message: error.message, issues: error.issues });
      else setProblem({ message: 'The file could not be read.', issues: [] });
    }
  }

  return (
    <div className="space-y-2">
      <label className="block text-sm font-medium" htmlFor="choices-file">
        Upload observed choices (CSV)
      </label>
      <input id="choices-file" type="file" accept=".csv,text/csv" className="block text-sm" onChange={(e) => onFile(e.target.files?.[0])} disabled={upload.isPending} />
      <p className="text-xs text-ink-soft">
        One row per participant and stage-2 item: columns participant, item (the served item id), choice (sooner or later) and optionally response_ms. Comma or semicolon
        separated; at most 5 MB and 100,000 rows. Uploading the same answers again changes nothing; a different answer for a recorded item refuses the file.
      </p>
      {upload.isPending ? <p className="text-sm text-ink-soft">Importing…</p> : null}
      {report ? (
        <Notice title="Imported">
          <p data-testid="upload-report">
            {report.rows} rows from “{report.file}”: {report.recorded} new answers, {report.alreadyRecorded} already on record, {report.participants} participants ({report.completedParticipants} now complete).
          </p>
          {report.notes.map((n) => (
            <p key={n}>{n}</p>
          ))}
        </Notice>
      ) : null}
      {problem ? <ProblemNotice title="Nothing was imported" problem={problem} testId="upload-issues" /> : null}
    </div>
  );
}
