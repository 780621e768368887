import { beforeEach, describe, expect, it, vi } from 'vitest';
import type { UseFormReturn } from 'react-hook-form';
import { ApiError } from '@/lib/api-client';
import { ROOT_ERROR, applyServerErrors } from './server-errors';

vi.mock('@/components/ui/toast', () => ({ toast: { error: vi.fn(), success: vi.fn(), info: vi.fn(), dismiss: vi.fn() } }));
const { toast } = await import('@/components/ui/toast');

function fakeForm(values: Record<string, unknown>) {
  const setError = vi.fn();
  const form = { getValues: () => values, setError } as unknown as UseFormReturn<Record<string, unknown>>;
  return { form, setError };
}

describe('applyServerErrors', () => {
  beforeEach(() => vi.clearAllMocks());

  it('puts each server field error on the matching input and focuses the first', () => {
    const { form, setError } = fakeForm({ email: '', name: '', customer: { phone: '' } });
    const error = new ApiError(400, 'validation_failed', 'Check the form', [
      { path: 'email', message: 'That address is already invited' },
      { path: 'customer.phone', message: 'Enter a phone number' },
    ]);

    applyServerErrors(error, form);

    expect(setError).toHaveBeenCalledWith('email', { type: 'server', message: 'That address is already invited' }, { shouldFocus: true });
    expect(setError).toHaveBeenCalledWith('customer.phone', { type: 'server', message: 'Enter a phone number' }, { shouldFocus: false });
    expect(setError).not.toHaveBeenCalledWith(ROOT_ERROR, expect.anything());
  });

  it('shows a 4xx without matching fields as one form-level message', () => {
    const { form, setError } = fakeForm({ email: '', password: '' });

    applyServerErrors(new ApiError(401, 'invalid_credentials', 'That e-mail and password do not match an account.'), form);

    expect(setError).toHaveBeenCalledWith(ROOT_ERROR, { type: 'server', message: 'That e-mail and password do not match an account.' });
    expect(toast.error).not.toHaveBeenCalled();
  });

  it('keeps field errors the form does not show, such as the token from a link, as a form-level message', () => {
    const { form, setError } = fakeForm({ password: '' });
    const error = new ApiError(400, 'validation_failed', 'Check the form', [
      { path: 'token', message: 'This link is not complete' },
      { path: 'password', message: 'Use at least 10 characters' },
    ]);

    applyServerErrors(error, form);

    expect(setError).toHaveBeenCalledWith('password', { type: 'server', message: 'Use at least 10 characters' }, { shouldFocus: true });
    expect(setError).toHaveBeenCalledWith(ROOT_ERROR, { type: 'server', message: 'This link is not complete' });
  });

  it('sends 5xx and network failures to a toast, not onto the form', () => {
    const { form, setError } = fakeForm({ email: '' });

    applyServerErrors(new ApiError(503, 'unavailable', 'Try again shortly'), form);
    applyServerErrors(new ApiError(0, 'network_error', 'We could not reach Platterpost.'), form);

    expect(setError).not.toHaveBeenCalled();
    expect(toast.error).toHaveBeenCalledWith('Something went wrong', 'Try again shortly');
    expect(toast.error).toHaveBeenCalledWith('No connection', 'We could not reach Platterpost.');
  });
});
