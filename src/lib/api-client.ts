import type { z } from 'zod';
import { apiErrorSchema, type FieldError } from '@shared/schemas/api-error';
import { signInResponseSchema, type SignInResponse } from '@shared/schemas/auth';

const API_BASE = '/api';

/** Every failed request is thrown as one of these, carrying the server's error body. */
export class ApiError extends Error {
  readonly status: number;
  readonly code: string;
  readonly fields: FieldError[];

  constructor(status: number, code: string, message: string, fields: FieldError[] = []) {
    super(message);
    this.name = 'ApiError';
    this.status = status;
    this.code = code;
    this.fields = fields;
  }

  /** Status 0 is our marker for "the request never got an answer". */
  get isNetworkError(): boolean {
    return this.status === 0;
  }

  /** Errors a person cannot fix by changing what they typed. */
  get isUnexpected(): boolean {
    return this.status === 0 || this.status >= 500;
  }
}

export function isApiError(error: unknown): error is ApiError {
  return error instanceof ApiError;
}

// The access token lives in memory only; the refresh token is an httpOnly cookie,
// so a page reload restores the session through POST /api/auth/refresh.
let accessToken: string | null = null;

export function setAccessToken(token: string | null): void {
  accessToken = token;
}

export function getAccessToken(): string | null {
  return accessToken;
}

let onUnauthenticated: () => void = () => {};

/** The session layer registers what happens when the session cannot be renewed. */
export function setUnauthenticatedHandler(handler: () => void): void {
  onUnauthenticated = handler;
}

const networkMessage = 'We could not reach Platterpost. Check your connection and try again.';

async function send(path: string, init: RequestInit): Promise<Response> {
  try {
    return await fetch(`${API_BASE}${path}`, { ...init, credentials: 'include' });
  } catch (error) {
    // Cancellation is not a failure; let the caller (usually TanStack Query) see it as such.
    if (error instanceof DOMException && error.name === 'AbortError') throw error;
    throw new ApiError(0, 'network_error', networkMessage);
  }
}

async function errorFrom(response: Response): Promise<ApiError> {
  const body: unknown = await response.json().catch(() => null);
  const parsed = apiErrorSchema.safeParse(body);
  if (parsed.success) {
    const { code, message, fields } = parsed.data.error;
    return new ApiError(response.status, code, message, fields ?? []);
  }
  const message =
    response.status >= 500
      ? 'Something went wrong on our side. Please try again in a moment.'
      : `The request failed (${response.status}).`;
  return new ApiError(response.status, response.status >= 500 ? 'internal' : 'unknown', message);
}

let refreshInFlight: Promise<SignInResponse | null> | null = null;

/**
 * Renews the access token from the refresh cookie. Calls made while one refresh is
 * running share it, because the server rotates the cookie and a second concurrent
 * refresh would present a token that was just replaced.
 * Resolves to null when there is no session to renew; throws on network or server errors.
 */
export function refreshSession(): Promise<SignInResponse | null> {
  refreshInFlight ??= (async () => {
    try {
      const response = await send('/auth/refresh', { method: 'POST', headers: { Accept: 'application/json' } });
      if (response.status === 400 || response.status === 401 || response.status === 403) {
        setAccessToken(null);
        return null;
      }
      if (!response.ok) throw await errorFrom(response);
      const session = signInResponseSchema.parse(await response.json());
      setAccessToken(session.accessToken);
      return session;
    } finally {
      refreshInFlight = null;
    }
  })();
  return refreshInFlight;
}

export interface RequestOptions<T> {
  /** JSON body, sent with Content-Type application/json; a FormData body is sent as multipart as it is. */
  body?: unknown;
  /** Query string values; undefined entries are left out. */
  params?: Record<string, string | number | boolean | undefined | null>;
  signal?: AbortSignal;
  headers?: Record<string, string>;
  /** Validates the response body; the result is typed by the schema. */
  schema?: z.ZodType<T>;
  /**
   * false for the sign-in family of endpoints: no bearer token and no refresh on 401,
   * because there a 401 means "wrong password", not "session expired".
   */
  auth?: boolean;
  /** 'blob' for binary answers (photos, labels); the schema is not applied then. */
  responseType?: 'json' | 'blob';
}

function withParams(path: string, params: RequestOptions<unknown>['params']): string {
  if (!params) return path;
  const search = new URLSearchParams();
  for (const [key, value] of Object.entries(params)) {
    if (value !== undefined && value !== null) search.set(key, String(value));
  }
  const query = search.toString();
  return query ? `${path}?${query}` : path;
}

async function request<T>(method: string, path: string, options: RequestOptions<T> = {}): Promise<T> {
  const { body, params, signal, headers, schema, auth = true, responseType = 'json' } = options;
  const url = withParams(path, params);
  // The browser writes the multipart boundary into Content-Type itself.
  const multipart = typeof FormData !== 'undefined' && body instanceof FormData;

  const attempt = (token: string | null) => {
    const finalHeaders: Record<string, string> = { Accept: responseType === 'blob' ? '*/*' : 'application/json', ...headers };
    if (body !== undefined && !multipart) finalHeaders['Content-Type'] = 'application/json';
    if (auth && token) finalHeaders.Authorization = `Bearer ${token}`;
    return send(url, {
      method,
      headers: finalHeaders,
      body: body === undefined ? undefined : multipart ? (body as FormData) : JSON.stringify(body),
      signal,
    });
  };

  const tokenUsed = accessToken;
  let response = await attempt(tokenUsed);

  if (response.status === 401 && auth) {
    // Another request may already have renewed the token while this one was in flight.
    const renewed = accessToken && accessToken !== tokenUsed ? accessToken : (await refreshSession())?.accessToken;
    if (!renewed) {
      const error = await errorFrom(response);
      onUnauthenticated();
      throw error;
    }
    // The session is alive again; a second 401 is about something else (a wrong
    // current password, say), so it is thrown as is and does not end the session.
    response = await attempt(renewed);
  }

  if (!response.ok) throw await errorFrom(response);
  if (responseType === 'blob') return (await response.blob()) as T;
  if (response.status === 204 || response.headers.get('Content-Length') === '0') return undefined as T;

  const contentType = response.headers.get('Content-Type') ?? '';
  const data: unknown = contentType.includes('json') ? await response.json() : await response.text();
  return schema ? schema.parse(data) : (data as T);
}

export const api = {
  get: <T = unknown>(path: string, options?: Omit<RequestOptions<T>, 'body'>) => request<T>('GET', path, options),
  post: <T = unknown>(path: string, options?: RequestOptions<T>) => request<T>('POST', path, options),
  put: <T = unknown>(path: string, options?: RequestOptions<T>) => request<T>('PUT', path, options),
  patch: <T = unknown>(path: string, options?: RequestOptions<T>) => request<T>('PATCH', path, options),
  delete: <T = unknown>(path: string, options?: RequestOptions<T>) => request<T>('DELETE', path, options),
};
