'use client';

import Link from 'next/link';
import { useRouter } from 'next/navigation';
import { useStudyContext } from '@/components/studies/study-context';
import { Button } from '@/components/ui/button';
import { Notice } from '@/components/ui/notice';
import { QueryState } from '@/components/ui/query-state';
import { ApiClientError } from '@/lib/client/api';
import { useDeleteDesign, useDesign, usePriors } from '@/lib/client/planner';
import { CommentsPanel } from './comments-panel';
import { DesignEditor } from './design-editor';
import { FreezePanel } from './freeze-panel';
import { useFlag } from './unsaved-flag';

/** One candidate design: settings and live numbers, freezing, and discussion. */
export function DesignPage({ designId }: { designId: number }) {
  const { study, can } = useStudyContext();
  const router = useRouter();
  const design = useDesign(study.id, designId);
  const priors = usePriors(study.id);
  const remove = useDeleteDesign(study.id);
  const canEdit = can('editor');
  const unsaved = useFlag();
  if (design.error instanceof ApiClientError && design.error.status === 404) {
    return (
      <Notice tone="error" title="Design not found">
        <Link href={`/studies/${study.id}/designs`} className="underline">
          Back to the designs
        </Link>
      </Notice>
    );
  }
  return (
    <QueryState query={design} label="Loading the design…">
      <QueryState query={priors} label="Loading prior sets…">
        {design.data && priors.data ? (
          <div className="space-y-6">
            <div className="flex flex-wrap items-center justify-between gap-2">
              <div>
                <Link href={`/studies/${study.id}/designs`} className="text-sm text-ink-soft hover:text-ink">
                  ← All designs
                </Link>
                <h2 data-testid="design-title">{design.data.name}</h2>
              </div>
              {canEdit && !design.data.latestVersion ? (
                <Button variant="secondary" size="sm" onClick={() => remove.mutate(designId, { onSuccess: () => router.push(`/studies/${study.id}/designs`) })}>
                  Delete draft
                </Button>
              ) : null}
            </div>
            {remove.error ? <Notice tone="error">{remove.error.message}</Notice> : null}
            <DesignEditor key={design.data.id} studyId={study.id} design={design.data} priors={priors.data} canEdit={canEdit} onDirtyChange={unsaved.set} />
            <div className="grid gap-6 lg:grid-cols-2">
              <FreezePanel studyId={study.id} design={design.data} canEdit={canEdit} unsaved={unsaved} />
              <CommentsPanel studyId={study.id} designId={designId} />
            </div>
          </div>
        ) : null}
      </QueryState>
    </QueryState>
  );
}
