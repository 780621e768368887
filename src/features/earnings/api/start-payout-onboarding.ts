import { useMutation } from '@tanstack/react-query';
import { payoutOnboardingDto, type PayoutOnboardingDto } from '@shared/schemas/money';
import { api } from '@/lib/api-client';
import type { Payee } from '../payee';

/** Opens (or reuses) the payee's connected account and returns a fresh link to the provider's onboarding page. */
export function startPayoutOnboarding(payee: Payee): Promise<PayoutOnboardingDto> {
  return api.post(`/${payee}/payout-account`, { schema: payoutOnboardingDto });
}

export function useStartPayoutOnboarding(payee: Payee) {
  return useMutation({
    mutationFn: () => startPayoutOnboarding(payee),
    // The person leaves for the provider's page; the earnings query is refreshed when they come back.
    onSuccess: (result) => window.location.assign(result.url),
  });
}
