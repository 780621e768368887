import type { Payee } from '../payee';

// The earnings page's query keys, nested like the app's key factory (src/lib/query-keys.ts): invalidating
// `all` refreshes the totals, the months, the statements and the payout account together.
export const earningsKeys = {
  all: ['earnings'] as const,
  summary: (payee: Payee) => [...earningsKeys.all, payee, 'summary'] as const,
  lines: (payee: Payee, period: string) => [...earningsKeys.all, payee, 'lines', period] as const,
  payoutAccount: (payee: Payee) => [...earningsKeys.all, payee, 'payout-account'] as const,
};
