import { useId, type ReactNode } from 'react';
import { cn } from '@/lib/cn';

export interface FieldProps {
  label: ReactNode;
  /** Short help shown under the label, linked to the control with aria-describedby. */
  hint?: ReactNode;
  error?: string;
  /** Marks the field "(optional)"; fields are required unless said otherwise. */
  optional?: boolean;
  id?: string;
  className?: string;
}

export interface FieldIds {
  controlId: string;
  describedBy: string | undefined;
  invalid: boolean;
}

export function useFieldIds(id: string | undefined, hint: ReactNode, error: string | undefined): FieldIds & { hintId: string; errorId: string } {
  const generated = useId();
  const controlId = id ?? generated;
  const hintId = `${controlId}-hint`;
  const errorId = `${controlId}-error`;
  const describedBy = [hint ? hintId : null, error ? errorId : null].filter(Boolean).join(' ') || undefined;
  return { controlId, hintId, errorId, describedBy, invalid: !!error };
}

export const controlClasses = (invalid: boolean) =>
  cn(
    'focus-ring block w-full rounded-control border bg-paper-raised px-3 text-ink placeholder:text-ink-faint',
    'disabled:cursor-not-allowed disabled:bg-paper-sunken disabled:text-ink-muted',
    invalid ? 'border-brick-solid' : 'border-ink-faint/70 hover:border-ink-muted',
  );

export function FieldError({ id, message }: { id: string; message?: string }) {
  if (!message) return null;
  return (
    <p id={id} className="mt-1.5 flex items-start gap-1.5 text-sm text-brick-text">
      <svg aria-hidden="true" viewBox="0 0 20 20" className="mt-0.5 size-4 shrink-0" fill="currentColor">
        <path d="M10 2a8 8 0 1 0 0 16 8 8 0 0 0 0-16Zm-.9 4h1.8v5.2H9.1V6Zm0 6.6h1.8v1.8H9.1v-1.8Z" />
      </svg>
      <span>{message}</span>
    </p>
  );
}

/** Label, hint and error around one control. */
export function FieldFrame({
  label,
  hint,
  error,
  optional,
  ids,
  className,
  children,
}: FieldProps & { ids: ReturnType<typeof useFieldIds>; children: ReactNode }) {
  return (
    <div className={className}>
      <label htmlFor={ids.controlId} className="block text-sm font-semibold text-ink-strong">
        {label}
        {optional ? <span className="ml-1 font-normal text-ink-muted">(optional)</span> : null}
      </label>
      {hint ? (
        <p id={ids.hintId} className="mt-0.5 text-sm text-ink-muted">
          {hint}
        </p>
      ) : null}
      <div className="mt-1.5">{children}</div>
      <FieldError id={ids.errorId} message={error} />
    </div>
  );
}
