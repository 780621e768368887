import { queryOptions, useQuery } from '@tanstack/react-query';
import { invitationPreviewSchema, type InvitationPreview } from '@shared/schemas/auth';
import { api } from '@/lib/api-client';
import { authKeys } from '@/lib/query-keys';

export function getInvitation(token: string, signal?: AbortSignal): Promise<InvitationPreview> {
  return api.get(`/auth/invitations/${encodeURIComponent(token)}`, { schema: invitationPreviewSchema, auth: false, signal });
}

export function getInvitationQueryOptions(token: string) {
  return queryOptions({
    queryKey: authKeys.invitation(token),
    queryFn: ({ signal }) => getInvitation(token, signal),
    staleTime: Infinity,
  });
}

export function useInvitation(token: string) {
  return useQuery({ ...getInvitationQueryOptions(token), enabled: token.length > 0 });
}
