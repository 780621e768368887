import { fieldErrorsFromZod } from '@shared/schemas/api-error';
import type { z } from 'zod';
import { AppError } from './errors';

/** Parses input with a shared schema; a failure becomes a 400 with one entry per field. */
export function parseInput<S extends z.ZodType>(schema: S, input: unknown): z.output<S> {
  const result = schema.safeParse(input);
  if (!result.success) throw AppError.validation(fieldErrorsFromZod(result.error));
  return result.data;
}
