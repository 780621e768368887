import { z } from 'zod';
import type { Role } from '../vocabulary';

// Which e-mails a person receives. Every message sent to a user is listed here under the template
// name the server sends it with; a person may turn each off, except the ones security needs.
// Messages to customers (who have no account) are not listed: the shop decides those.

export const emailGroups = ['security', 'cases', 'offers', 'network', 'integrations', 'money'] as const;
export type EmailGroup = (typeof emailGroups)[number];
export const emailGroupLabels: Record<EmailGroup, string> = {
  security: 'Security',
  cases: 'Your cases',
  offers: 'Cases offered to your lab',
  network: 'Network operations',
  integrations: 'Integrations',
  money: 'Statements and payouts',
};

export interface UserEmailMessage {
  template: string;
  group: EmailGroup;
  label: string;
  description: string;
  /** Who is sent it; the profile page lists only these. */
  roles: readonly Role[];
  /** Security needs it: it cannot be turned off. */
  required?: true;
}

const everyone: readonly Role[] = ['partner_admin', 'partner_staff', 'shipping_clerk', 'lab_technician', 'lab_manager', 'network_admin'];
const shop: readonly Role[] = ['partner_admin', 'partner_staff'];

export const userEmailMessages: readonly UserEmailMessage[] = [
  { template: 'password_reset', group: 'security', label: 'Password reset links', description: 'Sent only when someone asks to reset your password.', roles: everyone, required: true },
  { template: 'staff_invitation', group: 'security', label: 'Invitations', description: 'The link that lets a new colleague join.', roles: everyone, required: true },
  { template: 'referral_accepted', group: 'cases', label: 'A lab accepted a case', description: 'When a lab takes one of your shop’s cases.', roles: shop },
  { template: 'box_checked_in', group: 'cases', label: 'Box checked in at the lab', description: 'The lab has the device and has recorded its condition.', roles: shop },
  { template: 'case_on_hold', group: 'cases', label: 'Case on hold', description: 'The lab needs something before it can go on (box damage, a battery problem).', roles: shop },
  { template: 'case_transfer', group: 'cases', label: 'Case moves to another lab', description: 'The lab that has the device passes the case on.', roles: shop },
  { template: 'shipment_exception', group: 'cases', label: 'Carrier exceptions', description: 'The carrier reports a problem with a box on its way.', roles: shop },
  { template: 'lab_offer_new', group: 'offers', label: 'New offers', description: 'A case is offered to your lab, with the deadline to answer.', roles: ['lab_manager'] },
  { template: 'lab_case_auto_accepted', group: 'offers', label: 'Cases accepted by your rules', description: 'Your auto-accept rules took a case for the lab.', roles: ['lab_manager'] },
  { template: 'lab_offer_withdrawn', group: 'offers', label: 'Offers withdrawn', description: 'An offer or an accepted case was cancelled before the device was sent.', roles: ['lab_manager'] },
  { template: 'referral_needs_attention', group: 'network', label: 'Cases waiting for routing by hand', description: 'No lab qualified, so a case waits for the network.', roles: ['network_admin'] },
  { template: 'webhook_endpoint_disabled', group: 'integrations', label: 'Webhook endpoint disabled', description: 'An endpoint failed for a day and was switched off.', roles: ['partner_admin'] },
  { template: 'statement_ready', group: 'money', label: 'Monthly statement ready', description: 'Your organisation’s statement for the month.', roles: ['partner_admin', 'lab_manager'] },
  { template: 'payout_sent', group: 'money', label: 'Payout sent', description: 'A payout left for your account.', roles: ['partner_admin', 'lab_manager'] },
  { template: 'payout_failed', group: 'money', label: 'Payout failed', description: 'A payout did not go through and what happens next.', roles: ['partner_admin', 'lab_manager'] },
];

export const requiredEmailTemplates: readonly string[] = userEmailMessages.filter((m) => m.required).map((m) => m.template);

export const notificationPreferenceDto = z.object({
  template: z.string(),
  group: z.enum(emailGroups),
  label: z.string(),
  description: z.string(),
  enabled: z.boolean(),
  /** Cannot be turned off. */
  required: z.boolean(),
});
export type NotificationPreferenceDto = z.infer<typeof notificationPreferenceDto>;

export const notificationPreferencesDto = z.object({ messages: z.array(notificationPreferenceDto) });
export type NotificationPreferencesDto = z.infer<typeof notificationPreferencesDto>;

/** Template name → on or off. Templates left out keep their current choice. */
export const updateNotificationPreferencesInput = z.object({
  preferences: z.record(z.string().max(80), z.boolean()),
});
export type UpdateNotificationPreferencesInput = z.infer<typeof updateNotificationPreferencesInput>;
