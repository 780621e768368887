import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { endSession } from '@/lib/auth';

export function signOut(): Promise<void> {
  return api.post('/auth/sign-out');
}

export function useSignOut() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: signOut,
    // End the session on this screen even when the server could not be reached; the
    // mutation cache reports that failure, since the refresh cookie may then survive.
    onSettled: () => endSession(queryClient, { byPerson: true }),
  });
}
