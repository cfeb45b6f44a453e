import type { ReactNode } from 'react';

const tones = {
  info: 'border-teal-300 bg-teal-50 text-teal-700',
  warning: 'border-amber-400 bg-amber-50 text-amber-700',
  error: 'border-danger-500 bg-danger-50 text-danger-700',
} as const;

/** A boxed message; errors are announced to screen readers. */
export function Notice({ tone = 'info', title, children }: { tone?: keyof typeof tones; title?: string; children?: ReactNode }) {
  return (
    <div role={tone === 'error' ? 'alert' : 'status'} className={`rounded-md border px-4 py-3 text-sm ${tones[tone]}`}>
      {title ? <p className="font-semibold">{title}</p> : null}
      {children ? <div className={title ? 'mt-1' : ''}>{children}</div> : null}
    </div>
  );
}

/** A refused request or file: its message and, when there are any, every issue with its field or line. */
export type Problem = { message: string; issues: Array<{ path: string; message: string }> };

/** The error notice for a `Problem`: the message, then a list of the issues (`testId` names the list). */
export function ProblemNotice({ title, problem, testId }: { title: string; problem: Problem; testId: string }) {
  return (
    <Notice tone="error" title={title}>
      <p>{problem.message}</p>
      {problem.issues.length ? (
        <ul className="mt-1 list-disc pl-5" data-testid={testId}>
          {problem.issues.map((i, n) => (
            <li key={n}>
              {i.path} — {i.message}
            </li>
          ))}
        </ul>
      ) : null}
    </Notice>
  );
}
