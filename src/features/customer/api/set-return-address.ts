import { customerCaseDto, returnAddressInput, type CustomerCaseDto } from '@shared/schemas/customer';
import type { z } from 'zod';
import { api } from '@/lib/api-client';
import { asCustomer } from './customer-request';
import { useCustomerMutation } from './customer-mutation';

export { returnAddressInput };

export function setReturnAddress(token: string, values: z.output<typeof returnAddressInput>): Promise<CustomerCaseDto> {
  return api.put('/customer/case/return-address', asCustomer(token, { body: values, schema: customerCaseDto }));
}

export function useSetReturnAddress(token: string) {
  return useCustomerMutation(token, (values: z.output<typeof returnAddressInput>) => setReturnAddress(token, values));
}
