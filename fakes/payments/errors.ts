/** Error types of the provider's REST API, as its clients branch on them. */
export type ApiErrorType = 'invalid_request_error' | 'card_error' | 'idempotency_error' | 'api_error';

export interface ApiErrorBody {
  type: ApiErrorType;
  message: string;
  code?: string;
  param?: string;
  decline_code?: string;
  payment_intent?: unknown;
}

/** Thrown by a handler; the dispatcher turns it into `{ error: {...} }` with the given status. */
export class FakeApiError extends Error {
  constructor(
    readonly status: number,
    readonly body: ApiErrorBody,
  ) {
    super(body.message);
  }
}

export function invalidRequest(message: string, extra: { code?: string; param?: string } = {}): FakeApiError {
  return new FakeApiError(400, { type: 'invalid_request_error', message, ...extra });
}

/** The provider names objects with spaces in "No such …" messages, e.g. "No such checkout session". */
export function resourceMissing(objectName: string, id: string, param = 'id'): FakeApiError {
  return new FakeApiError(404, {
    type: 'invalid_request_error',
    code: 'resource_missing',
    param,
    message: `No such ${objectName}: '${id}'`,
  });
}

/** The body of an error response, in the provider's shape. */
export function errorResponse(body: ApiErrorBody): { error: ApiErrorBody } {
  return { error: body };
}
