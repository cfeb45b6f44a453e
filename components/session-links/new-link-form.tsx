'use client';

import { zodResolver } from '@hookform/resolvers/zod';
import { useForm, useWatch } from 'react-hook-form';
import { Button } from '@/components/ui/button';
import { TextArea, TextField } from '@/components/ui/field';
import { Notice } from '@/components/ui/notice';
import { VersionSelect } from '@/components/item-bank/version-select';
import type { FrozenVersionDto } from '@/lib/client/item-bank';
import { useCreateSessionLink } from '@/lib/client/session-page';
import { sessionLinkCreateSchema, type SessionLinkCreateInput } from '@/lib/shared/validations/session-links';

/** Creates a participant link for one frozen version: the team's consent text and instructions, completion code and redirect. */
export function NewLinkForm({ studyId, versions }: { studyId: number; versions: FrozenVersionDto[] }) {
  const create = useCreateSessionLink(studyId);
  const form = useForm<SessionLinkCreateInput>({
    resolver: zodResolver(sessionLinkCreateSchema),
    defaultValues: { designVersionId: versions[0]?.id, name: '', title: '', consentText: '', instructions: '', completionCode: '', redirectUrl: '', participantParam: 'pid' },
  });
  const versionId = useWatch({ control: form.control, name: 'designVersionId' });
  const errors = form.formState.errors;
  const submit = form.handleSubmit(async (input) => {
    const created = await create.mutateAsync(input).catch(() => null);
    if (created) form.reset({ ...input, name: '' });
  });
  return (
    <form onSubmit={submit} className="space-y-4" noValidate>
      <div className="grid gap-4 md:grid-cols-2">
        <TextField label="Link name" placeholder="e.g. Panel wave 1" hint="Only the team sees it." error={errors.name?.message} {...form.register('name')} />
        <VersionSelect versions={versions} value={versionId ?? null} onChange={(id) => form.setValue('designVersionId', id)} label="Runs frozen version" />
        <TextField label="Title participants see" placeholder="e.g. Choices about money and time" error={errors.title?.message} {...form.register('title')} />
        <TextField label="Participant id parameter" hint="The query parameter your panel puts the participant id in; the redirect passes it on under the same name." error={errors.participantParam?.message} {...form.register('participantParam')} />
      </div>
      <TextArea label="Consent text" rows={5} hint="As approved by your ethics board; participants agree to it before anything is recorded." error={errors.consentText?.message} {...form.register('consentText')} />
      <TextArea label="Instructions" rows={4} hint="Shown once, before the first choice." error={errors.instructions?.message} {...form.register('instructions')} />
      <div className="grid gap-4 md:grid-cols-2">
        <TextField label="Completion code" hint="Shown at the end. Leave empty to generate one." error={errors.completionCode?.message} {...form.register('completionCode')} />
        <TextField label="Redirect URL (optional)" placeholder="https://panel.example.org/complete" hint="Where Continue leads at the end, with the participant id added." error={errors.redirectUrl?.message} {...form.register('redirectUrl')} />
      </div>
      {create.error ? <Notice tone="error">{create.error.message}</Notice> : null}
      <Button type="submit" disabled={create.isPending}>
        {create.isPending ? 'Creating…' : 'Create link'}
      </Button>
    </form>
  );
}
