// The earnings page's query keys, nested like the app's key factory (src/lib/query-keys.ts): invalidating
// `all` refreshes the totals, the months, the statements and the payout account together.
export const earningsKeys = {
  all: ['earnings'] as const,
  summary: () => [...earningsKeys.all, 'summary'] as const,
  lines: (period: string) => [...earningsKeys.all, 'lines', period] as const,
};
