import type { ReactNode } from 'react';
import { FormProvider, useForm, useFormContext, type DefaultValues, type FieldValues, type UseFormReturn } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import type { z } from 'zod';
import { Alert } from '@/components/ui/alert';
import { cn } from '@/lib/cn';
import { ROOT_ERROR, applyServerErrors } from './server-errors';

export { applyServerErrors };

type Schema = z.ZodType<FieldValues, FieldValues>;

export type FormMethods<S extends Schema> = UseFormReturn<z.input<S>, unknown, z.output<S>>;

export interface FormProps<S extends Schema> {
  schema: S;
  /**
   * Receives the parsed values. If it throws, the error is mapped onto the form
   * (applyServerErrors), so callers can simply `await mutation.mutateAsync(values)`.
   */
  onSubmit: (values: z.output<S>, form: FormMethods<S>) => unknown;
  defaultValues?: DefaultValues<z.input<S>>;
  children: (form: FormMethods<S>) => ReactNode;
  className?: string;
  id?: string;
  /** Forms without a visible heading need a name for assistive technology. */
  'aria-label'?: string;
  'aria-labelledby'?: string;
}

/** The one form wrapper: zod validation through zodResolver, server errors on the fields. */
export function Form<S extends Schema>({ schema, onSubmit, defaultValues, children, className, id, ...aria }: FormProps<S>) {
  const form = useForm<z.input<S>, unknown, z.output<S>>({
    resolver: zodResolver(schema as never) as never,
    defaultValues,
    // Validate on submit first, then as the person corrects a field.
    mode: 'onSubmit',
    reValidateMode: 'onChange',
  });

  const submit = form.handleSubmit(async (values) => {
    try {
      await onSubmit(values, form);
    } catch (error) {
      applyServerErrors(error, form);
    }
  });

  return (
    <FormProvider {...form}>
      <form id={id} noValidate onSubmit={submit} className={cn('flex flex-col gap-5', className)} {...aria}>
        <FormError />
        {children(form)}
      </form>
    </FormProvider>
  );
}

/** The form-level message (wrong password, used link, too many attempts). */
export function FormError() {
  const {
    formState: { errors },
  } = useFormContext();
  const message = (errors.root?.server?.message as string | undefined) ?? undefined;
  // The live region stays mounted so that the message is announced when it appears.
  return (
    <div role="alert" aria-atomic="true" className={message ? undefined : 'sr-only'}>
      {message ? <Alert tone="danger">{message}</Alert> : null}
    </div>
  );
}

export { ROOT_ERROR };
