import { forwardRef, useId, type InputHTMLAttributes, type ReactNode, type SelectHTMLAttributes, type TextareaHTMLAttributes } from 'react';

const control =
  'block w-full rounded-md border border-ink/20 bg-paper-raised px-3 py-2 text-sm text-ink shadow-sm placeholder:text-ink-faint focus:border-teal-500 focus:outline-none aria-[invalid=true]:border-danger-500 disabled:cursor-not-allowed disabled:border-dashed disabled:border-ink/15 disabled:bg-paper-sunk disabled:text-ink-soft disabled:shadow-none';

type FieldShellProps = { label: string; error?: string; hint?: ReactNode; id: string; children: ReactNode };

/** Label, control, hint and inline error, wired together for screen readers. */
export function FieldShell({ label, error, hint, id, children }: FieldShellProps) {
  return (
    <div className="space-y-1">
      <label htmlFor={id} className="block text-sm font-medium text-ink">
        {label}
      </label>
      {children}
      {hint && !error ? <p className="text-xs text-ink-soft">{hint}</p> : null}
      {error ? (
        <p id={`${id}-error`} role="alert" className="text-xs text-danger-700">
          {error}
        </p>
      ) : null}
    </div>
  );
}

type Common = { label: string; error?: string; hint?: ReactNode };

export const TextField = forwardRef<HTMLInputElement, InputHTMLAttributes<HTMLInputElement> & Common>(function TextField(
  { label, error, hint, id, className = '', ...props },
  ref,
) {
  const auto = useId();
  const fieldId = id ?? auto;
  return (
    <FieldShell label={label} error={error} hint={hint} id={fieldId}>
      <input ref={ref} id={fieldId} aria-invalid={!!error} aria-describedby={error ? `${fieldId}-error` : undefined} className={`${control} ${className}`} {...props} />
    </FieldShell>
  );
});

export const TextArea = forwardRef<HTMLTextAreaElement, TextareaHTMLAttributes<HTMLTextAreaElement> & Common>(function TextArea(
  { label, error, hint, id, className = '', ...props },
  ref,
) {
  const auto = useId();
  const fieldId = id ?? auto;
  return (
    <FieldShell label={label} error={error} hint={hint} id={fieldId}>
      <textarea ref={ref} id={fieldId} aria-invalid={!!error} aria-describedby={error ? `${fieldId}-error` : undefined} className={`${control} ${className}`} {...props} />
    </FieldShell>
  );
});

export const SelectField = forwardRef<HTMLSelectElement, SelectHTMLAttributes<HTMLSelectElement> & Common>(function SelectField(
  { label, error, hint, id, className = '', children, ...props },
  ref,
) {
  const auto = useId();
  const fieldId = id ?? auto;
  return (
    <FieldShell label={label} error={error} hint={hint} id={fieldId}>
      <select ref={ref} id={fieldId} aria-invalid={!!error} className={`${control} ${className}`} {...props}>
        {children}
      </select>
    </FieldShell>
  );
});
