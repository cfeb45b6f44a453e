'use client';

import { useState } from 'react';
import { Notice, ProblemNotice, type Problem } from '@/components/ui/notice';
import { ApiClientError } from '@/lib/client/api';
import { useFitPilot, type PilotFitDto } from '@/lib/client/planner';
import { MODEL_CHOICES, PILOT_MAX_BYTES } from '@/lib/shared/validations/planner';
import { MODEL_LABELS } from './labels';

/**
 * Upload a pilot CSV, either per-person rates (participant, kSmall, kLarge) or raw choices (one row
 * per answered question, estimated with the calibration block's estimator under the chosen model);
 * the fitted prior is handed to the form for review.
 */
export function PilotUpload({ studyId, onFitted }: { studyId: number; onFitted: (fit: PilotFitDto, fileName: string) => void }) {
  const fit = useFitPilot(studyId);
  const [problem, setProblem] = useState<Problem | null>(null);
  const [done, setDone] = useState<string | null>(null);
  const [model, setModel] = useState<(typeof MODEL_CHOICES)[number]>('hyperbolic');

  async function onFile(file: File | undefined) {
    setProblem(null);
    setDone(null);
    if (!file) return;
    if (file.size > PILOT_MAX_BYTES) {
      setProblem({ message: `“${file.name}” is larger than 5 MB; upload at most 100,000 rows of participant, kSmall, kLarge.`, issues: [] });
      return;
    }
    try {
      const result = await fit.mutateAsync({ csv: await file.text(), model });
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
      <p className="text-xs text-ink-soft">
        Either per-person rates: columns participant, kSmall, kLarge (per day, one row per participant). Or raw choices: columns participant, magnitude (small or
        large), soonerAmount, soonerDelay, laterAmount, laterDelay (days), choice (sooner or later), one row per answered question; each person’s rates are then
        estimated the way the calibration block estimates them, under the model below. At most 5 MB and 100,000 rows.
      </p>
      <label className="block text-xs text-ink-soft">
        Model for raw choices{' '}
        <select className="ml-1 rounded border border-ink/20 bg-paper-raised px-1 py-0.5 text-xs text-ink" value={model} onChange={(e) => setModel(e.target.value as typeof model)} data-testid="pilot-model">
          {MODEL_CHOICES.map((m) => (
            <option key={m} value={m}>
              {MODEL_LABELS[m]}
            </option>
          ))}
        </select>
      </label>
      {fit.isPending ? <p className="text-sm text-ink-soft">Fitting…</p> : null}
      {done ? <Notice>{done}</Notice> : null}
      {problem ? <ProblemNotice title="The pilot file was not used" problem={problem} testId="pilot-issues" /> : null}
    </div>
  );
}
