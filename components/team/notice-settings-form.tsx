'use client';

import { useState } from 'react';
import { Button } from '@/components/ui/button';
import { Card } from '@/components/ui/card';
import { Notice } from '@/components/ui/notice';
import { QueryState } from '@/components/ui/query-state';
import { useNoticeSettings, useUpdateNoticeSettings } from '@/lib/client/team';
import type { NoticeSettingsInput } from '@/lib/shared/validations/team';

const OPTIONS: Array<{ key: keyof NoticeSettingsInput; label: string; hint: string }> = [
  { key: 'designFrozen', label: 'A design is frozen', hint: 'in any study you belong to, by someone other than you' },
  { key: 'powerRunFinished', label: 'A power run finishes', hint: 'in any study you belong to' },
];

/** The form itself, started from the stored settings. */
function NoticeForm({ email, initial }: { email: string; initial: NoticeSettingsInput }) {
  const update = useUpdateNoticeSettings();
  const [values, setValues] = useState<NoticeSettingsInput>(initial);
  const [saved, setSaved] = useState(false);

  const onSubmit = (event: React.FormEvent) => {
    event.preventDefault();
    setSaved(false);
    update.mutate(values, { onSuccess: () => setSaved(true) });
  };

  return (
    <form onSubmit={onSubmit} className="space-y-4">
      <p className="text-sm text-ink-soft">Send a message to {email} when:</p>
      {OPTIONS.map((o) => (
        <label key={o.key} className="flex items-start gap-3 text-sm">
          <input
            type="checkbox"
            className="mt-1"
            checked={values[o.key]}
            onChange={(e) => {
              setSaved(false);
              setValues({ ...values, [o.key]: e.target.checked });
            }}
          />
          <span>
            {o.label}
            <span className="block text-xs text-ink-soft">{o.hint}</span>
          </span>
        </label>
      ))}
      {update.error ? <Notice tone="error">{update.error.message}</Notice> : null}
      {saved ? <Notice>Saved.</Notice> : null}
      <Button type="submit" disabled={update.isPending}>
        Save
      </Button>
    </form>
  );
}

/** Which optional e-mail notices the signed-in user wants. */
export function NoticeSettingsForm({ email }: { email: string }) {
  const query = useNoticeSettings();
  return (
    <Card title="E-mail notices">
      <QueryState query={query} label="Loading your settings…">
        {query.data ? <NoticeForm email={email} initial={query.data} /> : null}
      </QueryState>
    </Card>
  );
}
