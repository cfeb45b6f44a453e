'use client';

import { SelectField } from '@/components/ui/field';
import type { FrozenVersionDto } from '@/lib/client/item-bank';

/** Picks one of the study's frozen design versions (name, version number, hash prefix). */
export function VersionSelect({ versions, value, onChange, label = 'Frozen design version' }: { versions: FrozenVersionDto[]; value: number | null; onChange: (id: number) => void; label?: string }) {
  return (
    <SelectField label={label} value={value ?? ''} onChange={(e) => onChange(Number(e.target.value))} data-testid="version-select">
      {versions.map((v) => (
        <option key={v.id} value={v.id}>
          {v.designName} · v{v.number} · {v.mode} · {v.hash.slice(0, 12)}
        </option>
      ))}
    </SelectField>
  );
}
