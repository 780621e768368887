import type { ComponentProps } from 'react';
import { cn } from '@/lib/cn';
import { FieldFrame, controlClasses, useFieldIds, type FieldProps } from './field';

export interface SelectOption {
  value: string;
  label: string;
  disabled?: boolean;
}

export type SelectProps = Omit<ComponentProps<'select'>, 'id' | 'children'> &
  FieldProps & {
    options: readonly SelectOption[];
    /** An empty first choice such as "Choose a role". */
    placeholder?: string;
  };

/** A native select: keyboard and screen-reader behaviour come with it. */
export function Select({ label, hint, error, optional, id, className, options, placeholder, ...props }: SelectProps) {
  const ids = useFieldIds(id, hint, error);
  return (
    <FieldFrame label={label} hint={hint} error={error} optional={optional} ids={ids} className={className}>
      <div className="relative">
        <select
          id={ids.controlId}
          aria-invalid={ids.invalid || undefined}
          aria-describedby={ids.describedBy}
          className={cn(controlClasses(ids.invalid), 'h-10 appearance-none pr-9')}
          {...props}
        >
          {placeholder !== undefined ? <option value="">{placeholder}</option> : null}
          {options.map((option) => (
            <option key={option.value} value={option.value} disabled={option.disabled}>
              {option.label}
            </option>
          ))}
        </select>
        <svg aria-hidden="true" viewBox="0 0 20 20" className="pointer-events-none absolute top-1/2 right-3 size-4 -translate-y-1/2 text-ink-muted" fill="none" stroke="currentColor" strokeWidth="2">
          <path d="m6 8 4 4 4-4" strokeLinecap="round" strokeLinejoin="round" />
        </svg>
      </div>
    </FieldFrame>
  );
}
