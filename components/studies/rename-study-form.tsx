'use client';

import { zodResolver } from '@hookform/resolvers/zod';
import { useQueryClient } from '@tanstack/react-query';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { Button } from '@/components/ui/button';
import { Card } from '@/components/ui/card';
import { TextArea, TextField } from '@/components/ui/field';
import { Notice } from '@/components/ui/notice';
import { ApiClientError } from '@/lib/client/api';
import { studyKeys, useUpdateStudy } from '@/lib/client/studies';
import { studySchema } from '@/lib/shared/validations/study';
import type { z } from 'zod';
import { useStudyContext } from './study-context';

type Values = z.input<typeof studySchema>;

/** Rename and describe the study. A stale version gets a 409: the typed text stays, and a reload is offered. */
export function RenameStudyForm() {
  const { study } = useStudyContext();
  const client = useQueryClient();
  const update = useUpdateStudy(study.id);
  const [conflict, setConflict] = useState(false);
  const [saved, setSaved] = useState(false);
  const { register, handleSubmit, formState, setError, reset } = useForm<Values>({
    resolver: zodResolver(studySchema),
    values: { name: study.name, description: study.description },
    resetOptions: { keepDirtyValues: true },
  });

  const onSubmit = handleSubmit(async (values) => {
    setConflict(false);
    setSaved(false);
    try {
      const updated = await update.mutateAsync({ ...values, version: study.version });
      reset({ name: updated.name, description: updated.description });
      setSaved(true);
    } catch (error) {
      if (error instanceof ApiClientError && error.status === 409) setConflict(true);
      else if (error instanceof ApiClientError) for (const issue of error.issues) setError(issue.path as keyof Values, { message: issue.message });
    }
  });

  return (
    <Card title="Rename">
      <form onSubmit={onSubmit} className="space-y-3" noValidate>
        {conflict ? (
          <Notice tone="warning" title="Someone else changed this study">
            Your text is still in the form. Load their version to compare, then save again.
            <div className="mt-2">
              <Button size="sm" variant="secondary" onClick={() => client.invalidateQueries({ queryKey: studyKeys.one(study.id) }).then(() => setConflict(false))}>
                Load the current version
              </Button>
            </div>
          </Notice>
        ) : null}
        {update.error && !conflict && !(update.error instanceof ApiClientError && update.error.issues.length) ? <Notice tone="error">{update.error.message}</Notice> : null}
        {saved && !formState.isDirty ? <Notice>Saved.</Notice> : null}
        <TextField label="Study name" {...register('name')} error={formState.errors.name?.message} />
        <TextArea label="Description" rows={4} {...register('description')} error={formState.errors.description?.message} />
        <Button type="submit" disabled={formState.isSubmitting || !formState.isDirty}>
          Save
        </Button>
      </form>
    </Card>
  );
}
