'use client';

import { useState } from 'react';
import { Button } from '@/components/ui/button';
import { Card } from '@/components/ui/card';
import { Notice } from '@/components/ui/notice';
import { QueryState } from '@/components/ui/query-state';
import { useFreezeDesign, useVersions, type DesignDto } from '@/lib/client/planner';
import { formatDateTime } from '@/lib/shared/format';
import { createFlag, useFlagValue, type Flag } from './unsaved-flag';

const NEVER = createFlag();

/**
 * Freeze status, the freeze button for editors, and the design's frozen versions with their hashes.
 * Freezing asks for confirmation first, and is refused while the form above has unsaved edits
 * (freezing stores the saved draft, so it would silently leave those edits out).
 */
export function FreezePanel({ studyId, design, canEdit, unsaved: unsavedFlag }: { studyId: number; design: DesignDto; canEdit: boolean; unsaved?: Flag }) {
  const unsaved = useFlagValue(unsavedFlag ?? NEVER);
  const freeze = useFreezeDesign(studyId, design.id);
  const [asking, setAsking] = useState(false);
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
        {canEdit && !asking ? (
          <Button onClick={() => setAsking(true)} disabled={freeze.isPending || design.frozen}>
            Freeze this design…
          </Button>
        ) : null}
        {canEdit && asking ? (
          <div role="alertdialog" aria-labelledby="freeze-question" className="space-y-2 rounded-md border border-amber-300 bg-amber-50 p-3" data-testid="freeze-confirm">
            {unsaved ? (
              <>
                <p id="freeze-question" className="font-medium">
                  Save your edits first.
                </p>
                <p className="text-xs">
                  The form above has unsaved changes. Freezing stores the saved draft, so these changes would not be in the frozen version. Save the design (or undo
                  the changes), then freeze.
                </p>
                <Button size="sm" variant="secondary" onClick={() => setAsking(false)}>
                  Back
                </Button>
              </>
            ) : (
              <>
                <p id="freeze-question" className="font-medium">
                  Freeze the saved draft as version {(latest?.number ?? 0) + 1}?
                </p>
                <p className="text-xs">A frozen version can never be changed. Exports, API keys and power runs will cite it by its hash.</p>
                <div className="flex gap-2">
                  <Button size="sm" onClick={() => freeze.mutate(undefined, { onSettled: () => setAsking(false) })} disabled={freeze.isPending}>
                    Freeze version {(latest?.number ?? 0) + 1}
                  </Button>
                  <Button size="sm" variant="secondary" onClick={() => setAsking(false)}>
                    Cancel
                  </Button>
                </div>
              </>
            )}
          </div>
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
