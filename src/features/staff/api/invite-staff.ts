import { useMutation, useQueryClient } from '@tanstack/react-query';
import { inviteStaffInput, staffMemberSchema, type InviteStaffInput, type StaffMember } from '@shared/schemas/auth';
import { api } from '@/lib/api-client';
import { staffKeys } from '@/lib/query-keys';

export { inviteStaffInput };

export function inviteStaff(input: InviteStaffInput): Promise<StaffMember> {
  return api.post('/organization/staff/invitations', { body: input, schema: staffMemberSchema });
}

export function useInviteStaff() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: inviteStaff,
    // Returned so the mutation stays pending until the list shows the new person.
    onSuccess: () => queryClient.invalidateQueries({ queryKey: staffKeys.all }),
  });
}
