'use client';

import { useState } from 'react';
import { Notice } from '@/components/ui/notice';
import { ApiClientError } from '@/lib/client/api';
import { useFitPilot, type PilotFitDto } from '@/lib/client/planner';
import { PILOT_MAX_BYTES } from '@/lib/shared/validations/planner';

/** Upload a pilot CSV (participant, kSmall, kLarge); the fitted prior is handed to the form for review. */
export function PilotUpload({ studyId, onFitted }: { studyId: number; onFitted: (fit: PilotFitDto, fileName: string) => void }) {
  const fit = useFitPilot(studyId);
  const [problem, setProblem] = useState<{ message: string; issues: Array<{ path: string; message: string }> } | null>(null);
  const [done, setDone] = useState<string | null>(null);

  async function onFile(file: File | undefined) {
    setProblem(null);
    setDone(null);
    if (!file) return;
    if (file.size > PILOT_MAX_BYTES) {
      setProblem({ message: `“${file.name}” is larger than 5 MB; upload at most 100,000 rows of participant, kSmall, kLarge.`, issues: [] });
      return;
    }
    try {
      const result = await fit.mutateAsync(await file.text());
      setDone(`Fitted from ${result.rows} participants in “${file.name}”. Review the values below and save.`);
      onFitted(result, file.name);
    } catch (error) {
      if (error instanceof ApiClientError) setProblem({ message: error.message, issues: error.issues });
      else setProblem({ message: 'The file could not be read.', issues: [] });
    }
  }

  return (
    <div className="space-y-2">
      <label className="block text-sm font-medium" htmlFor="pilot-file">
        Fit from pilot data (CSV)
      </label>
      <input id="pilot-file" type="file" accept=".csv,text/csv" className="block text-sm" onChange={(e) => onFile(e.target.files?.[0])} disabled={fit.isPending} />
      <p className="text-xs text-ink-soft">Columns participant, kSmall, kLarge (rates per day, one row per participant); at most 5 MB and 100,000 rows.</p>
      {fit.isPending ? <p className="text-sm text-ink-soft">Fitting…</p> : null}
      {done ? <Notice>{done}</Notice> : null}
      {problem ? (
        <Notice tone="error" title="The pilot file was not used">
          <p>{problem.message}</p>
          {problem.issues.length ? (
            <ul className="mt-1 list-disc pl-5" data-testid="pilot-issues">
              {problem.issues.map((i, n) => (
                <li key={n}>
                  {i.path} — {i.message}
                </li>
              ))}
            </ul>
          ) : null}
        </Notice>
      ) : null}
    </div>
  );
}
