'use client';

import { zodResolver } from '@hookform/resolvers/zod';
import { useRouter } from 'next/navigation';
import { useForm } from 'react-hook-form';
import { Button } from '@/components/ui/button';
import { Card } from '@/components/ui/card';
import { TextArea, TextField } from '@/components/ui/field';
import { Notice } from '@/components/ui/notice';
import { ApiClientError } from '@/lib/client/api';
import { useCreateStudy } from '@/lib/client/studies';
import { createStudySchema, type CreateStudyInput } from '@/lib/shared/validations/study';

export function NewStudyForm() {
  const router = useRouter();
  const create = useCreateStudy();
  const { register, handleSubmit, formState, setError } = useForm<CreateStudyInput>({ resolver: zodResolver(createStudySchema), defaultValues: { name: '', description: '' } });

  const onSubmit = handleSubmit(async (values) => {
    try {
      const study = await create.mutateAsync(values);
      router.push(`/studies/${study.id}`);
    } catch (error) {
      if (error instanceof ApiClientError) for (const issue of error.issues) setError(issue.path as keyof CreateStudyInput, { message: issue.message });
    }
  });

  return (
    <Card title="New study" className="mx-auto max-w-xl">
      <form onSubmit={onSubmit} className="space-y-4" noValidate>
        {create.error ? <Notice tone="error">{create.error.message}</Notice> : null}
        <TextField label="Study name" {...register('name')} error={formState.errors.name?.message} />
        <TextArea label="Description" rows={4} hint="What the study asks, and of whom. Optional." {...register('description')} error={formState.errors.description?.message} />
        <p className="text-xs text-ink-soft">You become the study&apos;s owner and can invite the rest of the team.</p>
        <div className="flex gap-2">
          <Button type="submit" disabled={formState.isSubmitting}>
            {formState.isSubmitting ? 'Creating…' : 'Create study'}
          </Button>
          <Button variant="secondary" onClick={() => router.back()}>
            Cancel
          </Button>
        </div>
      </form>
    </Card>
  );
}
