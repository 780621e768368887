import { z } from 'zod';
import { organizationKinds } from '../vocabulary';

// The network admin's audit log: security and money actions, newest first.

const DATE_ONLY = /^\d{4}-\d{2}-\d{2}$/;

/**
 * A date-time with its offset, or a calendar date. A calendar date is a whole day in UTC: `from`
 * starts at its midnight and `to` ends at the next one. A date-time `to` is exclusive.
 */
const instant = z
  .string()
  .trim()
  .refine((v) => (DATE_ONLY.test(v) ? !Number.isNaN(Date.parse(`${v}T00:00:00Z`)) : z.string().datetime({ offset: true }).safeParse(v).success), {
    message: 'Use a date (2026-03-04) or an ISO 8601 date-time with its offset',
  });

export const auditListQuery = z
  .object({
    /** An exact action ("auth.sign_in") or a family of them ("auth" matches every "auth.…"). */
    action: z
      .string()
      .trim()
      .max(80)
      .regex(/^[a-z0-9_.-]+$/, 'Use an action code such as auth.sign_in, or a family such as auth')
      .optional(),
    /** The acting user's id, or part of their name or e-mail. */
    actor: z.string().trim().min(1).max(120).optional(),
    organization: z.string().uuid('Not an organisation id').optional(),
    from: instant.optional(),
    to: instant.optional(),
    limit: z.coerce.number().int().min(1).max(200).default(50),
    cursor: z.string().max(200).optional(),
  })
  .superRefine((q, ctx) => {
    if (q.from && q.to && auditBounds(q).from! >= auditBounds(q).to!) {
      ctx.addIssue({ code: 'custom', path: ['to'], message: 'The end of the range must come after its start' });
    }
  });
export type AuditListQuery = z.input<typeof auditListQuery>;

/** The range as instants: from inclusive, to exclusive. */
export function auditBounds(q: { from?: string; to?: string }): { from: Date | null; to: Date | null } {
  const from = q.from ? new Date(DATE_ONLY.test(q.from) ? `${q.from}T00:00:00Z` : q.from) : null;
  let to: Date | null = null;
  if (q.to) {
    to = new Date(DATE_ONLY.test(q.to) ? `${q.to}T00:00:00Z` : q.to);
    if (DATE_ONLY.test(q.to)) to = new Date(to.getTime() + 86_400_000);
  }
  return { from, to };
}

export const auditEventDto = z.object({
  id: z.string().uuid(),
  at: z.string(),
  action: z.string(),
  /** Who did it; null for the system (a sweep, a webhook) or a failed sign-in without a known user. */
  actor: z.object({ id: z.string().uuid(), name: z.string(), email: z.string() }).nullable(),
  organization: z.object({ id: z.string().uuid(), name: z.string(), kind: z.enum(organizationKinds) }).nullable(),
  target: z.object({ type: z.string(), id: z.string().nullable() }).nullable(),
  details: z.record(z.string(), z.unknown()),
  ip: z.string().nullable(),
});
export type AuditEventDto = z.infer<typeof auditEventDto>;

export const auditListDto = z.object({ data: z.array(auditEventDto), nextCursor: z.string().nullable() });
export type AuditListDto = z.infer<typeof auditListDto>;

/** What the filters can choose from: every action written so far, and the organisations. */
export const auditFacetsDto = z.object({
  actions: z.array(z.object({ action: z.string(), count: z.number().int() })),
  organizations: z.array(z.object({ id: z.string().uuid(), name: z.string(), kind: z.enum(organizationKinds) })),
});
export type AuditFacetsDto = z.infer<typeof auditFacetsDto>;

/** Words for the families of actions the components write; an unknown family shows its code. */
export const auditFamilyLabels: Record<string, string> = {
  auth: 'Sign-in and passwords',
  staff: 'Staff',
  api_key: 'Partner API keys',
  lab_key: 'Lab API keys',
  webhook_endpoint: 'Webhook endpoints',
  webhook_delivery: 'Webhook deliveries',
  commission_plan: 'Commission plans',
  settlement: 'Settlement runs',
  payout: 'Payouts',
  payout_account: 'Payout accounts',
  payment: 'Payments',
  referral: 'Routing by hand',
  customer: 'Customer actions',
  customer_link: 'Customer links',
  lab_profile: 'Lab profiles',
  lab_work: 'Lab work',
  custody: 'Custody log',
  disposition: 'Media disposition',
};
