import { useId, type ComponentProps, type ReactNode } from 'react';
import { cn } from '@/lib/cn';
import { FieldError } from './field';

export interface Choice {
  value: string;
  label: ReactNode;
  hint?: ReactNode;
}

export interface ChoiceGroupProps extends Omit<ComponentProps<'input'>, 'type' | 'id' | 'value'> {
  legend: ReactNode;
  hint?: ReactNode;
  error?: string;
  optional?: boolean;
  choices: readonly Choice[];
  /** Radios pick one; checkboxes any number (react-hook-form reads them as an array). */
  type: 'radio' | 'checkbox';
  /** Lay choices out in columns on wider screens. */
  columns?: 1 | 2 | 3;
}

const columnClasses = { 1: '', 2: 'sm:grid-cols-2', 3: 'sm:grid-cols-2 lg:grid-cols-3' } as const;

/**
 * A fieldset of radios or checkboxes sharing one name; spread register(name) into it.
 * The legend names the group; the hint and the error are read with it.
 */
export function ChoiceGroup({ legend, hint, error, optional, choices, type, columns = 1, className, ...input }: ChoiceGroupProps) {
  const id = useId();
  const hintId = `${id}-hint`;
  const errorId = `${id}-error`;
  const describedBy = [hint ? hintId : null, error ? errorId : null].filter(Boolean).join(' ') || undefined;
  return (
    <fieldset className={className} aria-describedby={describedBy} aria-invalid={error ? true : undefined}>
      <legend className="text-sm font-semibold text-ink-strong">
        {legend}
        {optional ? <span className="ml-1 font-normal text-ink-muted">(optional)</span> : null}
      </legend>
      {hint ? (
        <p id={hintId} className="mt-0.5 text-sm text-ink-muted">
          {hint}
        </p>
      ) : null}
      <div className={cn('mt-2 grid gap-x-4 gap-y-2', columnClasses[columns])}>
        {choices.map((choice) => {
          const controlId = `${id}-${choice.value}`;
          return (
            <div key={choice.value} className="flex items-start gap-2.5">
              <input
                id={controlId}
                type={type}
                value={choice.value}
                className={cn('focus-ring mt-0.5 size-5 shrink-0 border-ink-faint accent-spruce-600', type === 'checkbox' ? 'rounded' : 'rounded-full')}
                aria-describedby={choice.hint ? `${controlId}-hint` : undefined}
                {...input}
              />
              <div>
                <label htmlFor={controlId} className="text-sm text-ink">
                  {choice.label}
                </label>
                {choice.hint ? (
                  <p id={`${controlId}-hint`} className="text-xs text-ink-muted">
                    {choice.hint}
                  </p>
                ) : null}
              </div>
            </div>
          );
        })}
      </div>
      <FieldError id={errorId} message={error} />
    </fieldset>
  );
}
