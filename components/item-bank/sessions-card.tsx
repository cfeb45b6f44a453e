'use client';

import { useState } from 'react';
import { Button } from '@/components/ui/button';
import { TextField } from '@/components/ui/field';
import { useSetIdleMinutes } from '@/lib/client/item-bank';

/** After how many idle minutes an unfinished session reads as abandoned (operators set it). */
export function SessionIdleTime({ studyId, current }: { studyId: number; current: number }) {
  const save = useSetIdleMinutes(studyId);
  const [value, setValue] = useState(String(current));
  return (
    <form
      className="flex flex-wrap items-end gap-2"
      onSubmit={(e) => {
        e.preventDefault();
        save.mutate(Number(value));
      }}
    >
      <TextField label="Abandoned after (minutes idle)" type="number" min={5} max={43200} value={value} onChange={(e) => setValue(e.target.value)} error={save.error?.message} />
      <Button type="submit" size="sm" variant="secondary" disabled={save.isPending}>
        Save idle time
      </Button>
    </form>
  );
}
