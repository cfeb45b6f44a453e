'use client';

import { Button } from '@/components/ui/button';
import { Card } from '@/components/ui/card';
import { Notice } from '@/components/ui/notice';
import { QueryState } from '@/components/ui/query-state';
import { useFreezeDesign, useVersions, type DesignDto } from '@/lib/client/planner';
import { formatDateTime } from '@/lib/shared/format';

/** Freeze status, the freeze button for editors, and the design's frozen versions with their hashes. */
export function FreezePanel({ studyId, design, canEdit }: { studyId: number; design: DesignDto; canEdit: boolean }) {
  const freeze = useFreezeDesign(studyId, design.id);
  const versions = useVersions(studyId, design.id);
  const latest = design.latestVersion;
  return (
    <Card title="Frozen versions">
      <div className="space-y-3 text-sm">
        <p data-testid="freeze-status">
          {latest && design.frozen
            ? `The saved draft is frozen as version ${latest.number}.`
            : latest
              ? `The saved draft has changed since version ${latest.number}; it is a new draft.`
              : 'Not frozen yet: exports and power runs need a frozen version.'}
        </p>
        {canEdit ? (
          <Button onClick={() => freeze.mutate()} disabled={freeze.isPending || design.frozen}>
            Freeze this design
          </Button>
        ) : null}
        {canEdit ? <p className="text-xs text-ink-soft">Freezing stores the saved draft and a copy of its prior’s values, hashed with SHA-256. Save your edits first.</p> : null}
        {freeze.error ? <Notice tone="error">{freeze.error.message}</Notice> : null}
        <QueryState query={versions} label="Loading versions…">
          <ul className="divide-y divide-ink/10" data-testid="version-list">
            {(versions.data ?? []).map((v) => (
              <li key={v.id} className="py-2">
                <p className="font-medium">Version {v.number}</p>
                <p className="break-all font-mono text-xs text-ink-soft" title="SHA-256 of the canonical JSON">
                  {v.hash}
                </p>
                <p className="text-xs text-ink-soft">
                  frozen {formatDateTime(v.createdAt)} ·{' '}
                  <a className="underline" href={`/api/studies/${studyId}/design-versions/${v.hash}`} target="_blank" rel="noreferrer">
                    frozen content (JSON)
                  </a>
                </p>
              </li>
            ))}
          </ul>
        </QueryState>
      </div>
    </Card>
  );
}
