import type { ErrorCode, FieldError } from '@shared/schemas/api-error';
import { fieldErrorsFromZod } from '@shared/schemas/api-error';
import type { ErrorRequestHandler, RequestHandler } from 'express';
import { ZodError } from 'zod';
import { logger } from './logger';

/** The one error type services throw; the central handler turns it into a response. */
export class AppError extends Error {
  constructor(
    readonly code: ErrorCode | (string & {}),
    readonly status: number,
    message: string,
    readonly fields?: FieldError[],
    options?: { cause?: unknown; headers?: Record<string, string> },
  ) {
    super(message, options);
    this.headers = options?.headers;
  }
  readonly headers?: Record<string, string>;

  static validation(fields: FieldError[], message = 'Some fields need attention') {
    return new AppError('validation_failed', 400, message, fields);
  }
  static notFound(what = 'That record') {
    return new AppError('not_found', 404, `${what} was not found`);
  }
  static unauthenticated(message = 'Sign in to continue') {
    return new AppError('unauthenticated', 401, message);
  }
  static forbidden(message = 'Your role does not allow this') {
    return new AppError('forbidden', 403, message);
  }
  static conflict(message: string, fields?: FieldError[]) {
    return new AppError('conflict', 409, message, fields);
  }
}

export function toAppError(err: unknown): AppError {
  if (err instanceof AppError) return err;
  if (err instanceof ZodError) return AppError.validation(fieldErrorsFromZod(err));
  const e = err as { type?: string; status?: number; expose?: boolean };
  // body-parser marks its own failures with a type.
  if (e?.type === 'entity.parse.failed') {
    return new AppError('malformed_json', 400, 'The request body is not valid JSON', [{ path: '(body)', message: 'Not valid JSON' }]);
  }
  if (e?.type === 'entity.too.large') return new AppError('payload_too_large', 413, 'The request body is too large');
  if (e?.type === 'encoding.unsupported' || e?.type === 'charset.unsupported') {
    return new AppError('validation_failed', 415, 'Send the body as UTF-8 JSON');
  }
  return new AppError('internal', 500, 'Something went wrong on our side. Try again, and tell us if it keeps happening.', undefined, {
    cause: err,
  });
}

export function errorBody(err: AppError) {
  return { error: { code: err.code, message: err.message, ...(err.fields?.length ? { fields: err.fields } : {}) } };
}

/** Logs what needs a person and answers without internals. */
export function reportError(err: unknown, context: Record<string, unknown> = {}): AppError {
  const appError = toAppError(err);
  if (appError.status >= 500) logger.error({ err: appError.cause ?? err, ...context }, 'unhandled error');
  return appError;
}

export const errorHandler: ErrorRequestHandler = (err, req, res, _next) => {
  const appError = reportError(err, { path: req.path, method: req.method });
  if (res.headersSent) return;
  for (const [k, v] of Object.entries(appError.headers ?? {})) res.setHeader(k, v);
  res.status(appError.status).json(errorBody(appError));
};

export const notFoundHandler: RequestHandler = (req, _res, next) => {
  next(new AppError('not_found', 404, `No API route for ${req.method} ${req.path}`));
};
