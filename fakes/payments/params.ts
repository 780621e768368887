import { z } from 'zod';
import { invalidRequest } from './errors';

/*
 * Request parameters arrive form-encoded (`line_items[0][price_data][unit_amount]=1000`), so every value
 * is a string. These helpers read them the way the provider does and report problems with its codes and
 * bracketed parameter names, so a typo in our server shows up here exactly as it would against the real API.
 */

const integerPattern = /^-?\d+$/;

/** A whole number sent as a string. */
export const formInt = (opts: { min?: number } = {}) =>
  z
    .union([z.string(), z.number()], { error: (iss) => `Invalid integer: ${String(iss.input)}` })
    .transform((value, ctx) => {
      const text = String(value).trim();
      const n = Number(text);
      if (!integerPattern.test(text) || !Number.isSafeInteger(n)) {
        ctx.addIssue({ code: 'custom', message: `Invalid integer: ${text}`, params: { stripeCode: 'parameter_invalid_integer' } });
        return z.NEVER;
      }
      if (opts.min !== undefined && n < opts.min) {
        ctx.addIssue({ code: 'custom', message: `This value must be greater than or equal to ${opts.min}.` });
        return z.NEVER;
      }
      return n;
    });

export const formBool = z
  .union([z.literal('true'), z.literal('false'), z.boolean()], { error: (iss) => `Invalid boolean: ${String(iss.input)}` })
  .transform((v) => v === true || v === 'true');

export const formString = (max = 5000) =>
  z
    .string({ error: (iss) => `Invalid string: ${JSON.stringify(iss.input)}` })
    .max(max, { message: `This value must be at most ${max} characters.` });

export const formEnum = <const T extends readonly [string, ...string[]]>(name: string, values: T) =>
  z.enum(values, { error: () => `Invalid ${name}: must be one of ${values.join(', ')}` });

/** http(s) URL, as the provider requires for redirect targets. */
export const formUrl = z.string().refine((v) => /^https?:\/\/[^\s]+$/i.test(v), { message: 'Not a valid URL' });

/** The provider's metadata limits (from memory): 50 keys, keys up to 40 characters, values up to 500. */
export const metadataParam = z
  .record(z.string().max(40, { message: 'Metadata keys must be at most 40 characters.' }), z.string().max(500, {
    message: 'Metadata values must be at most 500 characters.',
  }))
  .refine((m) => Object.keys(m).length <= 50, { message: 'Metadata can have at most 50 keys.' });

/** `expand[0]=payment_intent` — accepted on every endpoint. */
export const expandParam = z.array(z.string()).optional();

/** Pagination parameters shared by list endpoints. */
export const listParams = {
  limit: formInt({ min: 1 })
    .refine((n) => n <= 100, { message: 'This value must be less than or equal to 100.' })
    .optional(),
  starting_after: z.string().optional(),
  ending_before: z.string().optional(),
  expand: expandParam,
};

/** `a[b][0][c]` — how the provider names a nested parameter. */
export function bracketName(path: readonly PropertyKey[]): string {
  const [head, ...rest] = path.map(String);
  return (head ?? '') + rest.map((p) => `[${p}]`).join('');
}

function valueAt(input: unknown, path: readonly PropertyKey[]): unknown {
  let value: unknown = input;
  for (const key of path) {
    if (value === null || typeof value !== 'object') return undefined;
    value = (value as Record<PropertyKey, unknown>)[key];
  }
  return value;
}

/** Parses request parameters with `schema`, throwing the provider's 400 for the first problem found. */
export function parseParams<S extends z.ZodType>(schema: S, input: unknown): z.output<S> {
  const result = schema.safeParse(input ?? {});
  if (result.success) return result.data;
  const issue = result.error.issues[0];
  if (issue.code === 'unrecognized_keys') {
    const param = bracketName([...issue.path, issue.keys[0]]);
    throw invalidRequest(`Received unknown parameter: ${param}`, { code: 'parameter_unknown', param });
  }
  const param = bracketName(issue.path);
  if (valueAt(input, issue.path) === undefined) {
    throw invalidRequest(`Missing required param: ${param}.`, { code: 'parameter_missing', param });
  }
  const stripeCode = issue.code === 'custom' ? (issue.params?.stripeCode as string | undefined) : undefined;
  throw invalidRequest(`${issue.message} (parameter ${param})`, stripeCode ? { code: stripeCode, param } : { param });
}
