import { queryOptions, useQuery } from '@tanstack/react-query';
import { ledgerCheckDto, type LedgerCheckDto } from '@shared/schemas/money';
import { api } from '@/lib/api-client';
import { settlementKeys } from './keys';

export function getLedgerCheck(signal?: AbortSignal): Promise<LedgerCheckDto> {
  return api.get('/network/ledger/check', { schema: ledgerCheckDto, signal });
}

export function getLedgerCheckQueryOptions() {
  return queryOptions({ queryKey: settlementKeys.ledgerCheck(), queryFn: ({ signal }) => getLedgerCheck(signal) });
}

export function useLedgerCheck() {
  return useQuery(getLedgerCheckQueryOptions());
}
