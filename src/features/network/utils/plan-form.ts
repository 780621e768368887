import { z } from 'zod';
import { BASIS_POINTS_PER_WHOLE } from '@shared/domain/money';
import { commissionTiersSchema, type CommissionPlanDto, type CommissionPlanInput } from '@shared/schemas/money';

// The plan form speaks in percent (12.5), the API in basis points (1250). The order of the tiers (first
// at 0, thresholds rising) is checked by the shared schema, run on the converted tiers, so the form and
// the server can never disagree about it.

const toBasisPoints = (percent: number) => Math.round((percent * BASIS_POINTS_PER_WHOLE) / 100);
const toPercent = (basisPoints: number) => (basisPoints * 100) / BASIS_POINTS_PER_WHOLE;

/** A number typed into a field: empty is "give it", anything else must read as a number. */
const typedNumber = (what: string) =>
  z.preprocess(
    (v) => (v === '' || v === null || v === undefined ? undefined : typeof v === 'string' ? Number(v.trim().replace(',', '.')) : v),
    z.number({ error: (issue) => (issue.input === undefined ? `Give ${what}` : `${capitalised(what)} must be a number`) }),
  );

const capitalised = (text: string) => text.charAt(0).toUpperCase() + text.slice(1);

const percent = (what: string) =>
  typedNumber(what)
    .refine((v) => v >= 0, `${capitalised(what)} cannot be negative`)
    .refine((v) => v <= 50, `${capitalised(what)} can be at most 50 %`)
    .refine((v) => Math.abs(v * 100 - Math.round(v * 100)) < 1e-9, `${capitalised(what)} takes at most two decimals (12.25)`);

export const planFormSchema = z
  .object({
    name: z.string().trim().min(1, 'Give the plan a name').max(80, 'At most 80 characters'),
    networkFeePercent: percent('the network fee'),
    tiers: z
      .array(
        z.object({
          minPaidReferrals: typedNumber('the number of paid referrals')
            .refine((v) => Number.isInteger(v), 'Paid referrals must be a whole number')
            .refine((v) => v >= 0, 'Paid referrals cannot be negative'),
          percent: percent('the rate'),
        }),
      )
      .min(1, 'A plan needs at least one tier')
      .max(10, 'A plan has at most 10 tiers'),
    isDefault: z.boolean().default(false),
  })
  .superRefine((values, ctx) => {
    const checked = commissionTiersSchema.safeParse(values.tiers.map((t) => ({ minPaidReferrals: t.minPaidReferrals, basisPoints: toBasisPoints(t.percent) })));
    if (checked.success) return;
    // The range of each number is checked above, in percent; what is left is the order of the tiers.
    for (const issue of checked.error.issues.filter((i) => i.code === 'custom')) {
      const path = issue.path.map((p) => (p === 'basisPoints' ? 'percent' : p));
      ctx.addIssue({ code: 'custom', path: ['tiers', ...path], message: issue.message });
    }
  });

export type PlanFormInput = z.input<typeof planFormSchema>;
export type PlanFormValues = z.output<typeof planFormSchema>;

export function planInputFrom(values: PlanFormValues): CommissionPlanInput {
  return {
    name: values.name,
    networkFeeBasisPoints: toBasisPoints(values.networkFeePercent),
    tiers: values.tiers.map((t) => ({ minPaidReferrals: t.minPaidReferrals, basisPoints: toBasisPoints(t.percent) })),
    isDefault: values.isDefault,
  };
}

export function planFormValuesFrom(plan: CommissionPlanDto | null): PlanFormInput {
  if (!plan) return { name: '', networkFeePercent: 8, tiers: [{ minPaidReferrals: 0, percent: 10 }], isDefault: false };
  return {
    name: plan.name,
    networkFeePercent: toPercent(plan.networkFeeBasisPoints),
    tiers: plan.tiers.map((t) => ({ minPaidReferrals: t.minPaidReferrals, percent: toPercent(t.basisPoints) })),
    isDefault: plan.isDefault,
  };
}
