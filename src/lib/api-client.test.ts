import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { api, ApiError, getAccessToken, setAccessToken, setUnauthenticatedHandler } from './api-client';

const session = (token: string) => ({
  accessToken: token,
  user: {
    id: '00000000-0000-4000-8000-000000000001',
    email: 'theo@test.example',
    name: 'Theo',
    role: 'partner_staff',
    organization: { id: '00000000-0000-4000-8000-000000000002', kind: 'partner', name: 'Test shop' },
  },
});

const json = (status: number, body: unknown) => new Response(JSON.stringify(body), { status, headers: { 'Content-Type': 'application/json' } });
const unauthenticated = () => json(401, { error: { code: 'unauthenticated', message: 'Sign in again.' } });

type Handler = (url: string, init: RequestInit) => Response | Promise<Response>;

function stubFetch(handler: Handler) {
  const fetchMock = vi.fn((input: RequestInfo | URL, init: RequestInit = {}) => Promise.resolve(handler(String(input), init)));
  vi.stubGlobal('fetch', fetchMock);
  return fetchMock;
}

const authHeader = (init: RequestInit) => (init.headers as Record<string, string>).Authorization;

describe('api client', () => {
  let ended: ReturnType<typeof vi.fn<() => void>>;

  beforeEach(() => {
    setAccessToken(null);
    ended = vi.fn<() => void>();
    setUnauthenticatedHandler(ended);
  });

  afterEach(() => {
    vi.unstubAllGlobals();
  });

  it('sends JSON with the bearer token and cookies, and returns the parsed body', async () => {
    setAccessToken('token-a');
    const fetchMock = stubFetch(() => json(200, { ok: true }));

    const result = await api.post('/things', { body: { name: 'box' } });

    expect(result).toEqual({ ok: true });
    const [url, init = {}] = fetchMock.mock.calls[0];
    expect(url).toBe('/api/things');
    expect(init).toMatchObject({ method: 'POST', credentials: 'include', body: JSON.stringify({ name: 'box' }) });
    expect(init.headers).toMatchObject({ Authorization: 'Bearer token-a', 'Content-Type': 'application/json' });
  });

  it('sends a FormData body as multipart, leaving the Content-Type with its boundary to the browser', async () => {
    setAccessToken('token-a');
    const fetchMock = stubFetch(() => json(201, []));
    const body = new FormData();
    body.append('photos', new Blob(['x'], { type: 'image/png' }), 'label.png');

    await api.post('/referrals/r1/photos', { body });

    const [, init = {}] = fetchMock.mock.calls[0];
    expect(init.body).toBe(body);
    expect(init.headers).not.toHaveProperty('Content-Type');
    expect(init.headers).toMatchObject({ Authorization: 'Bearer token-a' });
  });

  it('returns a binary answer as a Blob when asked for one', async () => {
    setAccessToken('token-a');
    stubFetch(() => new Response(new Uint8Array([137, 80, 78, 71]), { status: 200, headers: { 'Content-Type': 'image/png' } }));

    const blob = await api.get<Blob>('/photos/p1', { responseType: 'blob' });

    expect(blob).toBeInstanceOf(Blob);
    expect(blob.size).toBe(4);
  });

  it('throws the server error body as an ApiError with status, code, message and fields', async () => {
    stubFetch(() => json(400, { error: { code: 'validation_failed', message: 'Check the form', fields: [{ path: 'email', message: 'Enter a valid e-mail address' }] } }));

    const error = await api.post('/things', { body: {} }).catch((e: unknown) => e);

    expect(error).toBeInstanceOf(ApiError);
    expect(error).toMatchObject({ status: 400, code: 'validation_failed', message: 'Check the form', fields: [{ path: 'email', message: 'Enter a valid e-mail address' }] });
  });

  it('turns a failed connection into a network ApiError with status 0', async () => {
    vi.stubGlobal('fetch', vi.fn(() => Promise.reject(new TypeError('Failed to fetch'))));

    const error = await api.get('/things').catch((e: unknown) => e);

    expect(error).toMatchObject({ status: 0, code: 'network_error', isUnexpected: true });
  });

  it('renews the token once on 401 and retries the request with the new token', async () => {
    setAccessToken('expired');
    const fetchMock = stubFetch((url, init) => {
      if (url === '/api/auth/refresh') return json(200, session('fresh'));
      return authHeader(init) === 'Bearer fresh' ? json(200, { id: 1 }) : unauthenticated();
    });

    const result = await api.get('/things/1');

    expect(result).toEqual({ id: 1 });
    expect(getAccessToken()).toBe('fresh');
    expect(fetchMock.mock.calls.map(([url]) => url)).toEqual(['/api/things/1', '/api/auth/refresh', '/api/things/1']);
  });

  it('shares one refresh between requests that fail at the same time', async () => {
    setAccessToken('expired');
    let refreshes = 0;
    stubFetch(async (url, init) => {
      if (url === '/api/auth/refresh') {
        refreshes += 1;
        await new Promise((resolve) => setTimeout(resolve, 5));
        return json(200, session('fresh'));
      }
      return authHeader(init) === 'Bearer fresh' ? json(200, { url }) : unauthenticated();
    });

    const results = await Promise.all([api.get('/a'), api.get('/b'), api.get('/c')]);

    expect(results).toEqual([{ url: '/api/a' }, { url: '/api/b' }, { url: '/api/c' }]);
    expect(refreshes).toBe(1);
  });

  it('ends the session when the refresh is refused, and throws the 401', async () => {
    setAccessToken('expired');
    stubFetch(() => unauthenticated());

    const error = await api.get('/things').catch((e: unknown) => e);

    expect(error).toMatchObject({ status: 401, code: 'unauthenticated' });
    expect(ended).toHaveBeenCalledTimes(1);
    expect(getAccessToken()).toBeNull();
  });

  it('keeps the session when a renewed request still answers 401, since the refresh proved it alive', async () => {
    setAccessToken('expired');
    stubFetch((url) => (url === '/api/auth/refresh' ? json(200, session('fresh')) : json(401, { error: { code: 'invalid_credentials', message: 'Current password is not right.' } })));

    const error = await api.post('/auth/password', { body: {} }).catch((e: unknown) => e);

    expect(error).toMatchObject({ status: 401, code: 'invalid_credentials' });
    expect(ended).not.toHaveBeenCalled();
    expect(getAccessToken()).toBe('fresh');
  });

  it('does not try to renew or send a token for auth: false requests such as sign-in', async () => {
    setAccessToken('stale');
    const fetchMock = stubFetch(() => json(401, { error: { code: 'invalid_credentials', message: 'That e-mail and password do not match an account.' } }));

    const error = await api.post('/auth/sign-in', { body: {}, auth: false }).catch((e: unknown) => e);

    expect(error).toMatchObject({ status: 401, message: 'That e-mail and password do not match an account.' });
    expect(fetchMock).toHaveBeenCalledTimes(1);
    expect(authHeader(fetchMock.mock.calls[0][1] ?? {})).toBeUndefined();
    expect(ended).not.toHaveBeenCalled();
  });

  it('returns undefined for 204 No Content', async () => {
    stubFetch(() => new Response(null, { status: 204 }));
    await expect(api.post('/auth/sign-out')).resolves.toBeUndefined();
  });
});
