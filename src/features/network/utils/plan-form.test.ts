import { describe, expect, it } from 'vitest';
import { planFormSchema, planFormValuesFrom, planInputFrom } from './plan-form';

const form = (tiers: { minPaidReferrals: unknown; percent: unknown }[], networkFeePercent: unknown = '8') => ({ name: 'Volume', networkFeePercent, tiers, isDefault: false });
const messages = (values: unknown) => {
  const result = planFormSchema.safeParse(values);
  return result.success ? [] : result.error.issues.map((i) => `${i.path.join('.')}: ${i.message}`);
};

describe('the commission plan form', () => {
  it('turns percent into basis points, as the API takes them', () => {
    const parsed = planFormSchema.parse(form([{ minPaidReferrals: '0', percent: '12.5' }, { minPaidReferrals: '20', percent: '14' }], '7.25'));
    expect(planInputFrom(parsed)).toEqual({
      name: 'Volume',
      networkFeeBasisPoints: 725,
      tiers: [
        { minPaidReferrals: 0, basisPoints: 1250 },
        { minPaidReferrals: 20, basisPoints: 1400 },
      ],
      isDefault: false,
    });
  });

  it('asks for a field left empty instead of reading it as 0', () => {
    expect(messages(form([{ minPaidReferrals: '0', percent: '' }], ''))).toEqual(['networkFeePercent: Give the network fee', 'tiers.0.percent: Give the rate']);
    expect(messages(form([{ minPaidReferrals: '0', percent: '10' }, { minPaidReferrals: '', percent: '12' }]))).toEqual(['tiers.1.minPaidReferrals: Give the number of paid referrals']);
  });

  it('refuses what the shared tier rules refuse, on the field concerned', () => {
    expect(messages(form([{ minPaidReferrals: '0', percent: '10' }, { minPaidReferrals: '20', percent: '14.125' }]))).toEqual([
      'tiers.1.percent: The rate takes at most two decimals (12.25)',
    ]);
    expect(messages(form([{ minPaidReferrals: '0', percent: '10' }, { minPaidReferrals: '0', percent: '14' }]))).toEqual([
      'tiers.1.minPaidReferrals: Each tier must start at more paid referrals than the one before',
    ]);
    expect(messages(form([{ minPaidReferrals: '0', percent: 'ten' }]))).toEqual(['tiers.0.percent: The rate must be a number']);
    expect(messages(form([{ minPaidReferrals: '0', percent: '60' }]))).toEqual(['tiers.0.percent: The rate can be at most 50 %']);
  });

  it('shows a stored plan in percent', () => {
    const values = planFormValuesFrom({
      id: '00000000-0000-4000-8000-000000000000',
      name: 'Standard',
      tiers: [{ minPaidReferrals: 0, basisPoints: 1225 }],
      networkFeeBasisPoints: 800,
      isDefault: true,
      partners: [],
      createdAt: '',
      updatedAt: '',
    });
    expect(values).toMatchObject({ networkFeePercent: 8, tiers: [{ minPaidReferrals: 0, percent: 12.25 }] });
  });
});
