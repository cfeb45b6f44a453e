'use client';

import { zodResolver } from '@hookform/resolvers/zod';
import { useState } from 'react';
import { useForm, useWatch } from 'react-hook-form';
import { Button } from '@/components/ui/button';
import { TextField } from '@/components/ui/field';
import { Notice } from '@/components/ui/notice';
import { useCreateApiKey, type FrozenVersionDto } from '@/lib/client/item-bank';
import { apiKeyCreateSchema, type ApiKeyCreateInput } from '@/lib/shared/validations/api-keys';
import { VersionSelect } from './version-select';

/** Creates a key for one frozen version and shows its secret once. */
export function ApiKeyForm({ studyId, versions }: { studyId: number; versions: FrozenVersionDto[] }) {
  const create = useCreateApiKey(studyId);
  const [secret, setSecret] = useState<string | null>(null);
  const form = useForm<ApiKeyCreateInput>({ resolver: zodResolver(apiKeyCreateSchema), defaultValues: { name: '', designVersionId: versions[0]?.id } });
  const versionId = useWatch({ control: form.control, name: 'designVersionId' });
  const submit = form.handleSubmit(async (input) => {
    setSecret(null);
    const created = await create.mutateAsync(input).catch(() => null);
    if (created) {
      setSecret(created.secret);
      form.reset({ name: '', designVersionId: input.designVersionId });
    }
  });
  return (
    <form onSubmit={submit} className="space-y-4" noValidate>
      <div className="grid gap-4 md:grid-cols-2">
        <TextField label="Key name" placeholder="e.g. Session software, lab room 2" error={form.formState.errors.name?.message} {...form.register('name')} />
        <VersionSelect versions={versions} value={versionId ?? null} onChange={(id) => form.setValue('designVersionId', id)} label="Serves frozen version" />
      </div>
      {create.error ? <Notice tone="error">{create.error.message}</Notice> : null}
      <Button type="submit" disabled={create.isPending}>
        {create.isPending ? 'Creating…' : 'Create key'}
      </Button>
      {secret ? (
        <Notice tone="warning" title="Copy this key now: it is shown only once">
          <code className="block break-all rounded bg-paper-raised px-2 py-1 font-mono text-xs text-ink" data-testid="new-secret">
            {secret}
          </code>
          Switchback keeps only a hash of it. Store it in your session software&apos;s settings; if it is lost, revoke it and create a new one.
        </Notice>
      ) : null}
    </form>
  );
}
