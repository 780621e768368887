import type { Role } from '@shared/vocabulary';

// Demo sign-ins, one per role. Every organisation and person here is invented
// (the .example domain is reserved for documentation by RFC 2606).
export const DEMO_PASSWORD = 'platterpost-demo';

export interface DemoAccount {
  role: Role;
  email: string;
  name: string;
  /** Key into the demo organisations in demo-data.ts. */
  organization: string;
}

export const demoAccounts: DemoAccount[] = [
  { role: 'partner_admin', email: 'maya.ferrante@juniperlane.example', name: 'Maya Ferrante', organization: 'juniper-lane' },
  { role: 'partner_staff', email: 'theo.brandt@juniperlane.example', name: 'Theo Brandt', organization: 'juniper-lane' },
  { role: 'shipping_clerk', email: 'lee.varga@quillmark.example', name: 'Lee Varga', organization: 'quillmark' },
  { role: 'lab_technician', email: 'sam.idowu@quillmark.example', name: 'Sam Idowu', organization: 'quillmark' },
  { role: 'lab_manager', email: 'rosa.quintero@quillmark.example', name: 'Rosa Quintero', organization: 'quillmark' },
  { role: 'network_admin', email: 'ines.albright@platterpost.example', name: 'Ines Albright', organization: 'network' },
];
