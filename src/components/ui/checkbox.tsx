import { type ComponentProps, type ReactNode } from 'react';
import { FieldError, useFieldIds } from './field';

export type CheckboxProps = Omit<ComponentProps<'input'>, 'id' | 'type'> & {
  label: ReactNode;
  hint?: ReactNode;
  error?: string;
  id?: string;
};

export function Checkbox({ label, hint, error, id, className, ...props }: CheckboxProps) {
  const ids = useFieldIds(id, hint, error);
  return (
    <div className={className}>
      <div className="flex items-start gap-3">
        <input
          type="checkbox"
          id={ids.controlId}
          aria-invalid={ids.invalid || undefined}
          aria-describedby={ids.describedBy}
          className="focus-ring mt-0.5 size-5 shrink-0 rounded border-ink-faint accent-spruce-600"
          {...props}
        />
        <div>
          <label htmlFor={ids.controlId} className="text-sm font-semibold text-ink-strong">
            {label}
          </label>
          {hint ? (
            <p id={ids.hintId} className="text-sm text-ink-muted">
              {hint}
            </p>
          ) : null}
        </div>
      </div>
      <FieldError id={ids.errorId} message={error} />
    </div>
  );
}
