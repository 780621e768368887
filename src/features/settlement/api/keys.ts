// The settlement page's query keys, nested like the app's key factory (src/lib/query-keys.ts): a run or a
// retry invalidates `all`, so the runs, the totals, the failures and the ledger check refresh together.
export const settlementKeys = {
  all: ['settlement'] as const,
  overview: () => [...settlementKeys.all, 'overview'] as const,
  period: (period: string) => [...settlementKeys.all, 'period', period] as const,
  ledgerCheck: () => [...settlementKeys.all, 'ledger-check'] as const,
};
