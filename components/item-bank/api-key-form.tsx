'use client';

import { zodResolver } from '@hookform/resolvers/zod';
import { useState } from 'react';
import { useForm, useWatch } from 'react-hook-form';
import { Button } from '@/components/ui/button';
import { SelectField, TextArea, TextField } from '@/components/ui/field';
import { Notice } from '@/components/ui/notice';
import { downloadStarter, useCreateApiKey, type FrozenVersionDto } from '@/lib/client/item-bank';
import { apiKeyCreateSchema, type ApiKeyCreateInput } from '@/lib/shared/validations/api-keys';
import { VersionSelect } from './version-select';

type Created = { secret: string; kind: 'server' | 'browser'; versionId: number };

/**
 * Creates a key for one frozen version and shows its secret once, with a copy button. A browser key
 * lists the origins it may be used from and can be downloaded at once inside the version's starter
 * experiment. The presentation settings (delay unit, gap, seed) are what the key's calibration block
 * and scoring use: an export with the same settings shows the same item-bank id.
 */
export function ApiKeyForm({ studyId, versions }: { studyId: number; versions: FrozenVersionDto[] }) {
  const create = useCreateApiKey(studyId);
  const [created, setCreated] = useState<Created | null>(null);
  const [copied, setCopied] = useState<boolean | null>(null);
  const [originsText, setOriginsText] = useState('');
  const form = useForm<ApiKeyCreateInput>({
    resolver: zodResolver(apiKeyCreateSchema),
    defaultValues: { name: '', designVersionId: versions[0]?.id, kind: 'server', allowedOrigins: [], delayUnit: 'days', minGap: 2, seed: null },
  });
  const versionId = useWatch({ control: form.control, name: 'designVersionId' });
  const kind = useWatch({ control: form.control, name: 'kind' });
  const submit = form.handleSubmit(async (input) => {
    setCreated(null);
    setCopied(null);
    const result = await create.mutateAsync(input).catch(() => null);
    if (result) {
      setCreated({ secret: result.secret, kind: input.kind ?? 'server', versionId: input.designVersionId });
      form.reset({ ...input, name: '' });
    }
  });
  const originsError = form.formState.errors.allowedOrigins;
  return (
    <form onSubmit={submit} className="space-y-4" noValidate>
      <div className="grid gap-4 md:grid-cols-2">
        <TextField label="Key name" placeholder="e.g. Session software, lab room 2" error={form.formState.errors.name?.message} {...form.register('name')} />
        <VersionSelect versions={versions} value={versionId ?? null} onChange={(id) => form.setValue('designVersionId', id)} label="Serves frozen version" />
        <SelectField label="Kind" hint="Server keys stay on the lab's back end; browser keys may sit inside a public page." {...form.register('kind')}>
          <option value="server">Server key (the lab&apos;s back end, any participant)</option>
          <option value="browser">Browser key (public page: listed origins, one participant per session token)</option>
        </SelectField>
        <TextArea
          label="Allowed origins"
          hint={kind === 'browser' ? 'One per line, e.g. https://lab.example.org (scheme, host and port; no path). Required for a browser key.' : 'Optional for a server key: browsers calling from these origins may read the replies.'}
          rows={2}
          value={originsText}
          error={originsError ? ('message' in originsError && originsError.message ? String(originsError.message) : 'Check the origins: scheme://host[:port], no path.') : undefined}
          onChange={(e) => {
            setOriginsText(e.target.value);
            form.setValue('allowedOrigins', e.target.value.split(/\s+/).filter(Boolean));
          }}
        />
        <SelectField label="Delay unit of the items" hint="As in the item-bank export: the calibration block and the scoring use the same items." {...form.register('delayUnit')}>
          <option value="days">days</option>
          <option value="weeks">weeks</option>
          <option value="months">months (30 days)</option>
        </SelectField>
        <TextField label="Gap between the views of a pair" type="number" min={1} max={20} error={form.formState.errors.minGap?.message} {...form.register('minGap', { valueAsNumber: true })} />
      </div>
      {create.error ? <Notice tone="error">{create.error.message}</Notice> : null}
      <Button type="submit" disabled={create.isPending}>
        {create.isPending ? 'Creating…' : 'Create key'}
      </Button>
      {created ? (
        <Notice tone="warning" title="Copy this key now: it is shown only once">
          <code className="block break-all rounded bg-paper-raised px-2 py-1 font-mono text-xs text-ink" data-testid="new-secret">
            {created.secret}
          </code>
          <span className="mt-2 flex flex-wrap gap-2">
            <Button
              type="button"
              size="sm"
              variant="secondary"
              onClick={() => copySecret(created.secret).then(setCopied)}
              data-testid="copy-secret"
            >
              {copied === true ? 'Copied' : 'Copy key'}
            </Button>
            {created.kind === 'browser' ? (
              <Button type="button" size="sm" variant="secondary" onClick={() => downloadStarter(studyId, created.versionId, created.secret)}>
                Download starter experiment with this key
              </Button>
            ) : null}
          </span>
          {copied === false ? (
            <span className="block text-danger-700" role="alert">
              This browser did not let the page copy. The key is selected above: copy it with Ctrl+C (⌘C on a Mac).
            </span>
          ) : null}
          Switchback keeps only a hash of it. {created.kind === 'browser' ? 'A browser key is meant to be public: it only runs participant sessions from its listed origins.' : 'Store it in your session software\u2019s settings; if it is lost, revoke it and create a new one.'}
        </Notice>
      ) : null}
    </form>
  );
}

/**
 * Copies the secret to the clipboard. Where the browser refuses (no clipboard outside https or
 * localhost, or permission denied) the key's text is selected instead, so one Ctrl+C copies it.
 */
async function copySecret(secret: string): Promise<boolean> {
  try {
    await navigator.clipboard.writeText(secret);
    return true;
  } catch {
    const code = document.querySelector('[data-testid="new-secret"]');
    if (code) window.getSelection()?.selectAllChildren(code);
    return false;
  }
}
