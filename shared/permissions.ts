import type { Role } from './vocabulary';

// What each role may do. The server's guard and the client's can() read this one table;
// the client only hides what the server would refuse anyway.
export const permissions = {
  'profile.read': ['partner_admin', 'partner_staff', 'shipping_clerk', 'lab_technician', 'lab_manager', 'network_admin'],
  'staff.read': ['partner_admin', 'lab_manager', 'network_admin'],
  'staff.invite': ['partner_admin', 'lab_manager', 'network_admin'],
  'organization.read': ['partner_admin', 'partner_staff', 'shipping_clerk', 'lab_technician', 'lab_manager', 'network_admin'],
  'network.organizations.read': ['network_admin'],
  'referrals.create': ['partner_admin', 'partner_staff'],
  'referrals.read': ['partner_admin', 'partner_staff', 'network_admin'],
  'referrals.cancel': ['partner_admin', 'partner_staff', 'network_admin'],
  'api-keys.manage': ['partner_admin'],
  'photos.upload': ['partner_admin', 'partner_staff'],
  // Every role may ask; the server shows a photo only to those who may see its case.
  'photos.read': ['partner_admin', 'partner_staff', 'shipping_clerk', 'lab_technician', 'lab_manager', 'network_admin'],
  'webhooks.manage': ['partner_admin'],
  'payouts.manage': ['partner_admin'],
  // A lab's payout account and its monthly statements.
  'lab-payouts.manage': ['lab_manager'],
  'offers.respond': ['lab_manager'],
  'lab-profile.manage': ['lab_manager', 'network_admin'],
  'inbound.read': ['shipping_clerk', 'lab_manager'],
  'inbound.check-in': ['shipping_clerk'],
  // Prepaid labels: the shop's staff buy them for the boxes they pack.
  'labels.buy': ['partner_admin', 'partner_staff'],
  // The lab's outgoing boxes: returns to the shop or customer and lab-to-lab transfers.
  'outbound.ship': ['shipping_clerk', 'lab_manager'],
  'bench.work': ['lab_technician', 'lab_manager'],
  'quotes.send': ['lab_manager'],
  // Giving the customer back all or part of a card payment.
  'refunds.issue': ['lab_manager'],
  // The lab's imaging tools post progress and manifests with keys the lab manager creates.
  'lab-api-keys.manage': ['lab_manager'],
  // The customer's private link: the shop hands it over and may switch it off; the network may too.
  'customer-link.manage': ['partner_admin', 'partner_staff', 'network_admin'],
  'network.manage': ['network_admin'],
  'settlement.run': ['network_admin'],
  'audit.read': ['network_admin'],
  // The case record: the custody log and the media disposition, shown to whoever may see the case
  // (the shop, the lab holding it, the network); the server scopes each case.
  'custody.read': ['partner_admin', 'partner_staff', 'shipping_clerk', 'lab_technician', 'lab_manager', 'network_admin'],
  // Handling inside the lab that no system sees (to the clean bench, imaged), written to the custody log by hand.
  'custody.append': ['shipping_clerk', 'lab_technician', 'lab_manager'],
  // Returning or sanitizing the original media and failed parts, with the certificate of sanitization.
  'disposition.record': ['lab_technician', 'lab_manager'],
  // Each person's own e-mail choices (security messages cannot be turned off).
  'notification-preferences.manage': ['partner_admin', 'partner_staff', 'shipping_clerk', 'lab_technician', 'lab_manager', 'network_admin'],
} as const satisfies Record<string, readonly Role[]>;

export type Permission = keyof typeof permissions;

export function roleCan(role: Role, permission: Permission): boolean {
  return (permissions[permission] as readonly Role[]).includes(role);
}

export function permissionsFor(role: Role): Permission[] {
  return (Object.keys(permissions) as Permission[]).filter((p) => roleCan(role, p));
}

/** Where each role lands after sign-in (the client maps these names to paths). */
export const roleHome: Record<Role, 'partner.cases' | 'lab.inbound' | 'lab.offers' | 'lab.bench' | 'admin.overview'> = {
  partner_admin: 'partner.cases',
  partner_staff: 'partner.cases',
  shipping_clerk: 'lab.inbound',
  lab_manager: 'lab.offers',
  lab_technician: 'lab.bench',
  network_admin: 'admin.overview',
};
