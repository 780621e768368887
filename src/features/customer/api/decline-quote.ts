import { customerCaseDto, declineQuoteInput, type CustomerCaseDto } from '@shared/schemas/customer';
import type { z } from 'zod';
import { api } from '@/lib/api-client';
import { asCustomer } from './customer-request';
import { useCustomerMutation } from './customer-mutation';

export { declineQuoteInput };

export function declineQuote(token: string, values: z.output<typeof declineQuoteInput>): Promise<CustomerCaseDto> {
  return api.post('/customer/case/quote/decline', asCustomer(token, { body: values, schema: customerCaseDto }));
}

export function useDeclineQuote(token: string) {
  return useCustomerMutation(token, (values: z.output<typeof declineQuoteInput>) => declineQuote(token, values));
}
