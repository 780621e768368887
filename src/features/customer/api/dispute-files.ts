import { customerCaseDto, disputeFilesInput, type CustomerCaseDto } from '@shared/schemas/customer';
import type { z } from 'zod';
import { api } from '@/lib/api-client';
import { asCustomer } from './customer-request';
import { useCustomerMutation } from './customer-mutation';

export { disputeFilesInput };

export function disputeFiles(token: string, values: z.output<typeof disputeFilesInput>): Promise<CustomerCaseDto> {
  return api.post('/customer/case/files/dispute', asCustomer(token, { body: values, schema: customerCaseDto }));
}

export function useDisputeFiles(token: string) {
  return useCustomerMutation(token, (values: z.output<typeof disputeFilesInput>) => disputeFiles(token, values));
}
