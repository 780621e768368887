import { z } from 'zod';
import { MAX_COMMISSION_BASIS_POINTS } from '../domain/commission';

// Money on the API: commission plans, payout accounts, settlement runs, statements, a shop's earnings and
// the ledger's balance check. Amounts are integer minor units with their ISO 4217 currency beside them.

export const periodSchema = z
  .string({ message: 'Give the month as YYYY-MM' })
  .regex(/^\d{4}-(0[1-9]|1[0-2])$/, 'Give the month as YYYY-MM, like 2025-11');

const minor = z.number().int();
const currency = z.string().regex(/^[A-Z]{3}$/);

export const commissionTierSchema = z.object({
  minPaidReferrals: z
    .number({ message: 'Paid referrals must be a number' })
    .int('Paid referrals must be a whole number')
    .min(0, 'Paid referrals cannot be negative')
    .max(100_000, 'At most 100 000 paid referrals'),
  basisPoints: z
    .number({ message: 'The rate must be a number of basis points' })
    .int('The rate must be a whole number of basis points (1250 = 12.5 %)')
    .min(0, 'The rate cannot be negative')
    .max(MAX_COMMISSION_BASIS_POINTS, `The rate can be at most ${MAX_COMMISSION_BASIS_POINTS} basis points (50 %)`),
});

export const commissionTiersSchema = z
  .array(commissionTierSchema)
  .min(1, 'A plan needs at least one tier')
  .max(10, 'A plan has at most 10 tiers')
  .superRefine((tiers, ctx) => {
    // The tier schema checks each number; the order of the thresholds is checked here.
    tiers.forEach((tier, index) => {
      if (index === 0 && tier.minPaidReferrals !== 0) {
        ctx.addIssue({ code: 'custom', path: [0, 'minPaidReferrals'], message: 'The first tier must start at 0 paid referrals' });
      }
      if (index > 0 && tier.minPaidReferrals <= tiers[index - 1]!.minPaidReferrals) {
        ctx.addIssue({ code: 'custom', path: [index, 'minPaidReferrals'], message: 'Each tier must start at more paid referrals than the one before' });
      }
    });
  });

const planName = z.string().trim().min(1, 'Give the plan a name').max(80, 'At most 80 characters');
const networkFeeBasisPoints = z
  .number({ message: 'The network fee must be a number of basis points' })
  .int('The network fee must be a whole number of basis points (800 = 8 %)')
  .min(0, 'The network fee cannot be negative')
  .max(MAX_COMMISSION_BASIS_POINTS, `The network fee can be at most ${MAX_COMMISSION_BASIS_POINTS} basis points (50 %)`);

/** POST /api/network/commission-plans */
export const commissionPlanInput = z.object({
  name: planName,
  tiers: commissionTiersSchema,
  networkFeeBasisPoints,
  isDefault: z.boolean().default(false),
});
export type CommissionPlanInput = z.input<typeof commissionPlanInput>;

/** PATCH /api/network/commission-plans/:id (a new rate applies to cases paid from then on). */
export const commissionPlanPatch = z
  .object({
    name: planName.optional(),
    tiers: commissionTiersSchema.optional(),
    networkFeeBasisPoints: networkFeeBasisPoints.optional(),
    isDefault: z.literal(true, { message: 'Make another plan the default instead of unsetting this one' }).optional(),
  })
  .refine((p) => Object.values(p).some((v) => v !== undefined), { message: 'Nothing to change' });
export type CommissionPlanPatch = z.input<typeof commissionPlanPatch>;

/** PUT /api/network/partners/:partnerId/commission-plan — null puts the shop back on the default plan. */
export const planAssignmentInput = z.object({ planId: z.uuid('Choose a plan').nullable() });

export const commissionPlanDto = z.object({
  id: z.uuid(),
  name: z.string(),
  tiers: z.array(commissionTierSchema),
  networkFeeBasisPoints: z.number().int(),
  isDefault: z.boolean(),
  partners: z.array(z.object({ id: z.uuid(), name: z.string() })),
  createdAt: z.string(),
  updatedAt: z.string(),
});
export type CommissionPlanDto = z.infer<typeof commissionPlanDto>;
export const commissionPlanListDto = z.object({ plans: z.array(commissionPlanDto) });

export const payoutAccountDto = z.object({
  status: z.enum(['none', 'onboarding', 'enabled', 'restricted']),
  accountId: z.string().nullable(),
  chargesEnabled: z.boolean(),
  payoutsEnabled: z.boolean(),
  detailsSubmitted: z.boolean(),
  requirementsDue: z.array(z.string()),
  updatedAt: z.string().nullable(),
});
export type PayoutAccountDto = z.infer<typeof payoutAccountDto>;
export const payoutOnboardingDto = z.object({ url: z.string(), account: payoutAccountDto });
export type PayoutOnboardingDto = z.infer<typeof payoutOnboardingDto>;

/** POST /api/partner/payout-account and /api/lab/payout-account: where the hosted pages send the person back. */
export const payoutOnboardingInput = z.object({}).default({});

export const statementStatuses = ['pending', 'paying', 'paid', 'failed', 'carried_forward', 'nothing_due', 'no_account'] as const;
export type StatementStatus = (typeof statementStatuses)[number];
export const statementStatusLabels: Record<StatementStatus, string> = {
  pending: 'Payout pending',
  paying: 'Paying',
  paid: 'Paid',
  failed: 'Payout failed',
  carried_forward: 'Carried forward',
  nothing_due: 'Nothing due',
  no_account: 'Waiting for payout account',
};

export const earningLineKinds = ['commission', 'commission_clawback', 'lab_share', 'lab_share_reversal'] as const;
export const earningLineKindLabels: Record<(typeof earningLineKinds)[number], string> = {
  commission: 'Commission',
  commission_clawback: 'Refund clawback',
  lab_share: 'Lab share',
  lab_share_reversal: 'Refund reversal',
};

export const statementDto = z.object({
  id: z.uuid(),
  organizationId: z.uuid(),
  organizationName: z.string(),
  payeeKind: z.enum(['partner', 'lab']),
  period: z.string(),
  currency,
  lineCount: z.number().int(),
  openingCarryMinor: minor,
  linesTotalMinor: minor,
  totalMinor: minor,
  payoutMinor: minor,
  carryForwardMinor: minor,
  status: z.enum(statementStatuses),
  transferId: z.string().nullable(),
  attempts: z.number().int(),
  lastError: z.string().nullable(),
  nextAttemptAt: z.string().nullable(),
  paidAt: z.string().nullable(),
  createdAt: z.string(),
});
export type StatementDto = z.infer<typeof statementDto>;
export const statementListDto = z.object({ statements: z.array(statementDto) });

export const earningLineDto = z.object({
  id: z.uuid(),
  kind: z.enum(earningLineKinds),
  referralId: z.uuid(),
  reference: z.string(),
  currency,
  amountMinor: minor,
  baseMinor: minor.nullable(),
  basisPoints: z.number().int().nullable(),
  accruedAt: z.string(),
  statementId: z.uuid().nullable(),
});
export type EarningLineDto = z.infer<typeof earningLineDto>;

export const statementDetailDto = statementDto.extend({ lines: z.array(earningLineDto) });
export type StatementDetailDto = z.infer<typeof statementDetailDto>;

export const earningsTotalsDto = z.object({
  currency,
  /** Every line ever accrued (commissions less clawbacks). */
  accruedMinor: minor,
  /** Paid out to the payout account. */
  paidMinor: minor,
  /** Accrued and not paid yet: this month's lines and statements waiting for their payout (negative: owed back). */
  pendingMinor: minor,
  /** Lines not on a statement yet. */
  unsettledMinor: minor,
  /** A negative balance waiting to be set against the next statement (≤ 0). */
  carriedForwardMinor: minor,
});

export const earningsDto = z.object({
  totals: z.array(earningsTotalsDto),
  months: z.array(z.object({ period: z.string(), currency, accruedMinor: minor, paidMinor: minor, lineCount: z.number().int() })),
  statements: z.array(statementDto),
  recentLines: z.array(earningLineDto),
  payoutAccount: payoutAccountDto,
});
export type EarningsDto = z.infer<typeof earningsDto>;

/** POST /api/network/settlements — `organizationIds` settles only those shops and labs (e.g. after fixing one). */
export const settlementRunInput = z.object({
  period: periodSchema,
  organizationIds: z.array(z.uuid('Not an organisation id')).min(1).max(10_000).optional(),
});
export type SettlementRunInput = z.input<typeof settlementRunInput>;

export const settlementRunDto = z.object({
  id: z.uuid(),
  period: z.string(),
  trigger: z.enum(['manual', 'schedule', 'retry']),
  status: z.enum(['running', 'completed', 'completed_with_failures', 'interrupted']),
  startedAt: z.string(),
  finishedAt: z.string().nullable(),
  startedByName: z.string().nullable(),
  summary: z.object({
    statementsCreated: z.number().int(),
    paid: z.number().int(),
    failed: z.number().int(),
    waitingForAccount: z.number().int(),
    carriedForward: z.number().int(),
    paidMinorByCurrency: z.record(z.string(), minor),
  }),
});
export type SettlementRunDto = z.infer<typeof settlementRunDto>;

export const periodSummaryDto = z.object({
  period: z.string(),
  currency,
  statements: z.number().int(),
  paidMinor: minor,
  dueMinor: minor,
  failed: z.number().int(),
  waitingForAccount: z.number().int(),
  carriedForwardMinor: minor,
});

export const settlementOverviewDto = z.object({
  runs: z.array(settlementRunDto),
  periods: z.array(periodSummaryDto),
  failures: z.array(statementDto),
  /** The newest month that has ended: what a run now would settle. */
  suggestedPeriod: z.string(),
  unsettled: z.array(z.object({ currency, partnerMinor: minor, labMinor: minor, lineCount: z.number().int() })),
});
export type SettlementOverviewDto = z.infer<typeof settlementOverviewDto>;

export const settlementPeriodDto = z.object({ period: z.string(), statements: z.array(statementDto), runs: z.array(settlementRunDto) });

export const ledgerCheckDto = z.object({
  balanced: z.boolean(),
  checkedAt: z.string(),
  transactionCount: z.number().int(),
  entryCount: z.number().int(),
  /** Sum of every entry per currency: 0 when the books balance. */
  currencies: z.array(z.object({ currency, sumMinor: minor, entries: z.number().int() })),
  /** Transactions whose entries do not sum to zero (none when the database trigger is doing its job). */
  unbalancedTransactions: z.array(z.object({ id: z.uuid(), kind: z.string(), currency, sumMinor: minor })),
  /** Payable accounts whose balance disagrees with their earning lines less payouts. */
  subledgerMismatches: z.array(z.object({ organizationId: z.uuid(), kind: z.string(), currency, ledgerMinor: minor, linesMinor: minor })),
  accounts: z.array(z.object({ kind: z.string(), currency, accounts: z.number().int(), balanceMinor: minor })),
});
export type LedgerCheckDto = z.infer<typeof ledgerCheckDto>;
