'use client';

import { useState } from 'react';
import { Card } from '@/components/ui/card';
import { SelectField } from '@/components/ui/field';
import { Notice } from '@/components/ui/notice';
import { QueryState } from '@/components/ui/query-state';
import { useStudyContext } from '@/components/studies/study-context';
import { useVersions } from '@/lib/client/planner';
import { formatDate } from '@/lib/shared/format';
import { useAnalyses, useAnalysis, type AnalysisDto } from '@/lib/client/results';
import type { StoredAnalysis } from '@/lib/shared/results/stored-analysis';
import { AnalysisView } from './analysis-view';
import { NewAnalysisForm } from './new-analysis-form';
import { UploadChoices } from './upload-choices';

/** The results section: saved analyses for everyone, the upload for operators, a new analysis for editors. */
export function ResultsPage() {
  const { study, can } = useStudyContext();
  const versions = useVersions(study.id);
  const analyses = useAnalyses(study.id);
  const [chosenVersion, setVersionId] = useState<number | null>(null);
  const [chosenAnalysis, setSelected] = useState<number | null>(null);
  // until someone picks, the newest analysis is shown, and a new analysis starts from the version
  // that one analysed (a newer frozen version usually has no participants yet), else the newest version
  const selected = chosenAnalysis ?? analyses.data?.[0]?.id ?? null;
  const analysedVersion = analyses.data?.find((a) => a.id === selected)?.designVersion.id;
  const versionId = chosenVersion ?? analysedVersion ?? versions.data?.[0]?.id ?? null;
  const analysis = useAnalysis(study.id, selected);

  return (
    <div className="space-y-6">
      <Card title="Saved analyses">
        <QueryState query={analyses}>
          {analyses.data?.length ? (
            <SelectField label="Analysis" value={selected ?? ''} onChange={(e) => setSelected(Number(e.target.value))}>
              {analyses.data.map((a: AnalysisDto) => (
                <option key={a.id} value={a.id}>
                  {a.label} — design version {a.designVersion.number} ({formatDate(a.createdAt)})
                </option>
              ))}
            </SelectField>
          ) : (
            <p className="text-sm text-ink-soft">No analysis saved yet. Upload or collect stage-2 answers, state the exclusion rules, and run one below.</p>
          )}
        </QueryState>
      </Card>
      {selected !== null ? (
        <QueryState query={analysis}>{analysis.data?.result ? <AnalysisView studyId={study.id} analysis={analysis.data as AnalysisDto & { result: StoredAnalysis }} /> : null}</QueryState>
      ) : null}
      {can('operator') || can('editor') ? (
        <Card title="Observed choices and a new analysis">
          <QueryState query={versions}>
            {versions.data?.length ? (
              <div className="space-y-6">
                <SelectField label="Frozen design version" value={versionId ?? ''} onChange={(e) => setVersionId(Number(e.target.value))}>
                  {versions.data.map((v) => (
                    <option key={v.id} value={v.id}>
                      {v.content.spec.name}, version {v.number} ({v.hash.slice(0, 12)})
                    </option>
                  ))}
                </SelectField>
                {can('operator') ? <UploadChoices studyId={study.id} /> : null}
                {can('editor') && versionId !== null ? <NewAnalysisForm studyId={study.id} versionId={versionId} onCreated={setSelected} /> : null}
              </div>
            ) : (
              <p className="text-sm text-ink-soft">Freeze a design first: analyses compare what a frozen version expected with what participants chose.</p>
            )}
          </QueryState>
        </Card>
      ) : null}
      <Notice title="About these results">
        Estimates describe hypothetical choices of this sample; they are not a clinical assessment of any person, and discount rates are not a diagnostic test. Studies with real rewards or deception
        follow the local ethics board&apos;s rules.
      </Notice>
    </div>
  );
}
