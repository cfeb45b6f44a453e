'use client';

import { useRouter } from 'next/navigation';
import { useState } from 'react';
import { Button } from '@/components/ui/button';
import { Card } from '@/components/ui/card';
import { TextField } from '@/components/ui/field';
import { Notice } from '@/components/ui/notice';
import { useDeleteStudy } from '@/lib/client/studies';
import { useStudyContext } from './study-context';

/** Deleting needs the study's name typed out: it removes every design, export and run in it. */
export function DeleteStudy() {
  const { study } = useStudyContext();
  const router = useRouter();
  const remove = useDeleteStudy(study.id);
  const [confirming, setConfirming] = useState(false);
  const [typed, setTyped] = useState('');

  return (
    <Card title="Delete study">
      {!confirming ? (
        <div className="space-y-3">
          <p className="text-sm text-ink-soft">Removes the study and everything in it for every member. The audit trail keeps a record that it happened.</p>
          <Button variant="danger" onClick={() => setConfirming(true)}>
            Delete study…
          </Button>
        </div>
      ) : (
        <div className="space-y-3" role="dialog" aria-label="Confirm deletion">
          {remove.error ? <Notice tone="error">{remove.error.message}</Notice> : null}
          <TextField label={`Type the study name to confirm: ${study.name}`} value={typed} onChange={(e) => setTyped(e.target.value)} autoFocus />
          <div className="flex gap-2">
            <Button
              variant="danger"
              disabled={typed.trim() !== study.name || remove.isPending}
              onClick={() => remove.mutate(undefined, { onSuccess: () => router.push('/studies') })}
            >
              {remove.isPending ? 'Deleting…' : 'Delete for everyone'}
            </Button>
            <Button variant="secondary" onClick={() => setConfirming(false)}>
              Cancel
            </Button>
          </div>
        </div>
      )}
    </Card>
  );
}
