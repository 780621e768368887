import type { ComponentProps } from 'react';
import { cn } from '@/lib/cn';
import { FieldFrame, controlClasses, useFieldIds, type FieldProps } from './field';

export type InputProps = Omit<ComponentProps<'input'>, 'id'> & FieldProps;

/** A labelled text input; spread react-hook-form's register() into it. */
export function Input({ label, hint, error, optional, id, className, ...props }: InputProps) {
  const ids = useFieldIds(id, hint, error);
  return (
    <FieldFrame label={label} hint={hint} error={error} optional={optional} ids={ids} className={className}>
      <input
        id={ids.controlId}
        aria-invalid={ids.invalid || undefined}
        aria-describedby={ids.describedBy}
        className={cn(controlClasses(ids.invalid), 'h-10')}
        {...props}
      />
    </FieldFrame>
  );
}
