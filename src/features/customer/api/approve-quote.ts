import { approveQuoteInput, customerCaseDto, type CustomerCaseDto } from '@shared/schemas/customer';
import type { z } from 'zod';
import { api } from '@/lib/api-client';
import { asCustomer } from './customer-request';
import { useCustomerMutation } from './customer-mutation';

export { approveQuoteInput };

export function approveQuote(token: string, values: z.output<typeof approveQuoteInput>): Promise<CustomerCaseDto> {
  return api.post('/customer/case/quote/approve', asCustomer(token, { body: values, schema: customerCaseDto }));
}

export function useApproveQuote(token: string) {
  return useCustomerMutation(token, (values: z.output<typeof approveQuoteInput>) => approveQuote(token, values));
}
