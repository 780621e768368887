import type { ComponentProps } from 'react';
import { cn } from '@/lib/cn';
import { FieldFrame, controlClasses, useFieldIds, type FieldProps } from './field';

export type TextareaProps = Omit<ComponentProps<'textarea'>, 'id'> & FieldProps;

export function Textarea({ label, hint, error, optional, id, className, rows = 4, ...props }: TextareaProps) {
  const ids = useFieldIds(id, hint, error);
  return (
    <FieldFrame label={label} hint={hint} error={error} optional={optional} ids={ids} className={className}>
      <textarea
        id={ids.controlId}
        rows={rows}
        aria-invalid={ids.invalid || undefined}
        aria-describedby={ids.describedBy}
        className={cn(controlClasses(ids.invalid), 'py-2')}
        {...props}
      />
    </FieldFrame>
  );
}
