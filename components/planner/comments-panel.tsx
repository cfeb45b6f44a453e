'use client';

import { zodResolver } from '@hookform/resolvers/zod';
import { useForm } from 'react-hook-form';
import type { z } from 'zod';
import { Button } from '@/components/ui/button';
import { Card } from '@/components/ui/card';
import { TextArea } from '@/components/ui/field';
import { Notice } from '@/components/ui/notice';
import { QueryState } from '@/components/ui/query-state';
import { useAddComment, useComments } from '@/lib/client/planner';
import { formatDateTime } from '@/lib/shared/format';
import { commentSchema } from '@/lib/shared/validations/planner';

/** Discussion of a design: every member, viewers included, may comment. */
export function CommentsPanel({ studyId, designId }: { studyId: number; designId: number }) {
  const comments = useComments(studyId, designId);
  const add = useAddComment(studyId, designId);
  const { register, handleSubmit, formState, reset } = useForm<z.input<typeof commentSchema>>({ resolver: zodResolver(commentSchema), defaultValues: { text: '' } });
  const onSubmit = handleSubmit(async ({ text }) => {
    await add.mutateAsync(text);
    reset({ text: '' });
  });
  return (
    <Card title="Discussion">
      <QueryState query={comments} label="Loading comments…">
        {(comments.data ?? []).length === 0 ? <p className="text-sm text-ink-soft">No comments yet.</p> : null}
        <ul className="space-y-3" data-testid="comment-list">
          {(comments.data ?? []).map((c) => (
            <li key={c.id} className="rounded-md bg-paper px-3 py-2 text-sm">
              <p className="text-xs text-ink-soft">
                {c.author?.name ?? 'A former member'} · {formatDateTime(c.createdAt)}
              </p>
              <p className="whitespace-pre-line">{c.text}</p>
            </li>
          ))}
        </ul>
      </QueryState>
      <form onSubmit={onSubmit} noValidate className="mt-4 space-y-2">
        <TextArea label="Add a comment" rows={3} {...register('text')} error={formState.errors.text?.message} />
        {add.error ? <Notice tone="error">{add.error.message}</Notice> : null}
        <Button type="submit" size="sm" disabled={formState.isSubmitting}>
          Post comment
        </Button>
      </form>
    </Card>
  );
}
