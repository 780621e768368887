import { z } from 'zod';

// Every error the API answers has this one shape.
export const fieldErrorSchema = z.object({ path: z.string(), message: z.string() });
export type FieldError = z.infer<typeof fieldErrorSchema>;

export const apiErrorSchema = z.object({
  error: z.object({
    code: z.string(),
    message: z.string(),
    fields: z.array(fieldErrorSchema).optional(),
  }),
});
export type ApiErrorBody = z.infer<typeof apiErrorSchema>;

export const errorCodes = [
  'validation_failed',
  'malformed_json',
  'unauthenticated',
  'forbidden',
  'not_found',
  'conflict',
  'rate_limited',
  'account_locked',
  'payload_too_large',
  'internal',
  'unavailable',
] as const;
export type ErrorCode = (typeof errorCodes)[number];

/** Turns zod issues into the API's field list ("customer.email", "symptoms.0"). */
export function fieldErrorsFromZod(error: z.ZodError): FieldError[] {
  return error.issues.map((issue) => ({
    path: issue.path.map(String).join('.') || '(body)',
    message: issue.message,
  }));
}
