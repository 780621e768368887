import { useMutation } from '@tanstack/react-query';
import { checkoutDto } from '@shared/schemas/customer';
import { api } from '@/lib/api-client';
import { asCustomer } from './customer-request';

/** The hosted payment page for the approved quote; the browser goes there next. */
export function startCheckout(token: string): Promise<{ url: string }> {
  return api.post('/customer/case/checkout', asCustomer(token, { body: {}, schema: checkoutDto }));
}

export function useStartCheckout(token: string) {
  return useMutation({ mutationFn: () => startCheckout(token) });
}
