import { customerCaseDto, type CustomerCaseDto } from '@shared/schemas/customer';
import { api } from '@/lib/api-client';
import { asCustomer } from './customer-request';
import { useCustomerMutation } from './customer-mutation';

/** Back from the payment page: the server asks the payment provider about that session at once. */
export function confirmCheckout(token: string, sessionId: string): Promise<CustomerCaseDto> {
  return api.post('/customer/case/checkout/confirm', asCustomer(token, { body: { sessionId }, schema: customerCaseDto }));
}

export function useConfirmCheckout(token: string) {
  return useCustomerMutation(token, (sessionId: string) => confirmCheckout(token, sessionId));
}
