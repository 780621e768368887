// The one key factory. Keys nest (all → lists → list(filters) → detail(id)) so that
// invalidating a parent key refreshes everything under it.

export const authKeys = {
  all: ['auth'] as const,
  me: ['auth', 'me'] as const,
  invitation: (token: string) => ['auth', 'invitation', token] as const,
};

export type CaseListFilters = Record<string, string | number | boolean | undefined>;

export const caseKeys = {
  all: ['cases'] as const,
  lists: () => [...caseKeys.all, 'list'] as const,
  list: (filters: CaseListFilters = {}) => [...caseKeys.lists(), filters] as const,
  details: () => [...caseKeys.all, 'detail'] as const,
  detail: (id: string) => [...caseKeys.details(), id] as const,
};

export const staffKeys = {
  all: ['staff'] as const,
  lists: () => [...staffKeys.all, 'list'] as const,
};
