import { z } from 'zod';
import { emailSchema, staffMemberSchema } from './auth';
import { timeZoneSchema } from './labs';
import { addressSchema } from './referrals';

// Onboarding: the network admin adds a shop or a lab to the network and invites the person who will
// run it there. A lab starts without a profile, so nothing is routed to it until that person (or the
// network admin) has said what it can do.

export const onboardableKinds = ['partner', 'lab'] as const;
export type OnboardableKind = (typeof onboardableKinds)[number];

/** The role of the first person of each kind of organisation: the one who invites the rest. */
export const firstRoleOf = { partner: 'partner_admin', lab: 'lab_manager' } as const;

const text = (max: number) => z.string().trim().max(max, `Use at most ${max} characters`);

/** POST /api/network/organizations */
export const onboardOrganizationInput = z.object({
  kind: z.enum(onboardableKinds, { message: 'Choose partner (a shop) or lab' }),
  name: text(120).min(2, 'Enter the name it trades under'),
  email: emailSchema.optional(),
  phone: text(40).regex(/^[+()0-9 .-]*$/, 'Use digits, spaces and + ( ) - . only').optional(),
  address: addressSchema,
  timeZone: timeZoneSchema,
  admin: z.object({
    name: text(120).min(1, 'Enter a name'),
    email: emailSchema,
  }),
});
export type OnboardOrganizationInput = z.input<typeof onboardOrganizationInput>;

export const organizationDto = z.object({
  id: z.uuid(),
  kind: z.enum(['partner', 'lab', 'network']),
  name: z.string(),
  email: z.string().nullable(),
  phone: z.string().nullable(),
  address: z.object({ line1: z.string().nullable(), city: z.string().nullable(), region: z.string().nullable(), postalCode: z.string().nullable(), country: z.string() }),
  location: z.object({ lat: z.number(), lon: z.number() }).nullable(),
  timeZone: z.string(),
  active: z.boolean(),
});
export type OrganizationDto = z.infer<typeof organizationDto>;

export const onboardedOrganizationDto = z.object({ organization: organizationDto, admin: staffMemberSchema });
export type OnboardedOrganizationDto = z.infer<typeof onboardedOrganizationDto>;

/** PUT /api/network/organizations/:id/active: switching a shop or lab off (or on again), with why. */
export const organizationActiveInput = z
  .object({
    active: z.boolean({ message: 'Say true (switched on) or false (switched off)' }),
    reason: text(300).optional(),
  })
  .superRefine((v, ctx) => {
    if (!v.active && !v.reason) ctx.addIssue({ code: 'custom', path: ['reason'], message: 'Say why it is switched off; the audit log keeps it' });
  });
export type OrganizationActiveInput = z.input<typeof organizationActiveInput>;
