import { z } from 'zod';

/**
 * Adds a "type it again" field to a schema with a new password. The check lives only in
 * the client: the API takes the password once.
 */
export function withConfirmation<Shape extends z.ZodRawShape, Key extends keyof Shape & string>(schema: z.ZodObject<Shape>, passwordKey: Key) {
  return schema
    .extend({ confirmPassword: z.string().min(1, 'Type the new password again') })
    .refine((values) => {
      const record = values as Record<string, unknown>;
      return record[passwordKey] === record.confirmPassword;
    }, {
      message: 'The two passwords are not the same',
      path: ['confirmPassword'],
    });
}
