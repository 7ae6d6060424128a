import { describe, expect, it } from 'vitest';
import { api, ApiError } from '../../../src/lib/api-client.ts';
import { stubApi } from '../helpers/fake-api.ts';

describe('api client', () => {
  it('sends JSON with the session cookie and returns the parsed body', async () => {
    const stub = stubApi({ 'POST /api/studies': (req) => ({ status: 201, body: { id: 'x1', version: 1, echo: req.body } }) });
    const out = await api.post<{ id: string; echo: unknown }>('/api/studies', { name: 'Tarn Moss' });
    expect(out).toEqual({ id: 'x1', version: 1, echo: { name: 'Tarn Moss' } });
    const init = stub.fetch.mock.calls[0][1] as RequestInit;
    expect(init.credentials).toBe('same-origin');
    expect((init.headers as Record<string, string>)['Content-Type']).toBe('application/json');
  });

  it('drops empty query values and keeps the rest', async () => {
    const stub = stubApi({ 'GET /api/studies': () => ({ body: { items: [] } }) });
    await api.get('/api/studies', { query: { q: '', page: 2, template: undefined, sort: 'name' } });
    expect(stub.calls[0].url.search).toBe('?page=2&sort=name');
  });

  it('throws a typed ApiError with code, message and field messages from the contract shape', async () => {
    stubApi({
      'POST /api/studies': () => ({ status: 400, body: { error: { code: 'validation', message: 'Check the fields', fields: { name: 'Name is required' } } } }),
    });
    const error = await api.post('/api/studies', {}).catch((e: unknown) => e);
    expect(error).toBeInstanceOf(ApiError);
    expect(error).toMatchObject({ status: 400, code: 'validation', message: 'Check the fields', fields: { name: 'Name is required' } });
  });

  it('takes the retry time from the body, or from Retry-After when the body has none', async () => {
    stubApi({ 'POST /api/auth/sign-in': () => ({ status: 429, body: { error: { code: 'rate-limited', message: 'Slow down' } }, headers: { 'Retry-After': '120' } }) });
    const error = (await api.post('/api/auth/sign-in', {}).catch((e: unknown) => e)) as ApiError;
    expect(error.status).toBe(429);
    expect(error.retryAfterSeconds).toBe(120);
  });

  it('still gives words when the answer is not the API error shape', async () => {
    stubApi({ 'GET /api/team': () => ({ status: 502, body: 'Bad Gateway' }) });
    const error = (await api.get('/api/team').catch((e: unknown) => e)) as ApiError;
    expect(error.code).toBe('internal');
    expect(error.message).toBe('The server could not complete the request (HTTP 502). Try again in a moment.');
  });

  it('returns nothing for 204', async () => {
    stubApi({ 'DELETE /api/studies/:id': () => ({ status: 204 }) });
    await expect(api.delete('/api/studies/abc')).resolves.toBeUndefined();
  });
});
