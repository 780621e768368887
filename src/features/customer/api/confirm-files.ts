import { customerCaseDto, type CustomerCaseDto } from '@shared/schemas/customer';
import { api } from '@/lib/api-client';
import { asCustomer } from './customer-request';
import { useCustomerMutation } from './customer-mutation';

export function confirmFiles(token: string, manifestId: string): Promise<CustomerCaseDto> {
  return api.post('/customer/case/files/confirm', asCustomer(token, { body: { manifestId }, schema: customerCaseDto }));
}

export function useConfirmFiles(token: string) {
  return useCustomerMutation(token, (manifestId: string) => confirmFiles(token, manifestId));
}
