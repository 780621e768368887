import { useMutation } from '@tanstack/react-query';
import { payoutOnboardingDto, type PayoutOnboardingDto } from '@shared/schemas/money';
import { api } from '@/lib/api-client';

/** Opens (or reuses) the shop's connected account and returns a fresh link to the provider's onboarding page. */
export function startPayoutOnboarding(): Promise<PayoutOnboardingDto> {
  return api.post('/partner/payout-account', { schema: payoutOnboardingDto });
}

export function useStartPayoutOnboarding() {
  return useMutation({
    mutationFn: startPayoutOnboarding,
    // The person leaves for the provider's page; the earnings query is refreshed when they come back.
    onSuccess: (result) => window.location.assign(result.url),
  });
}
