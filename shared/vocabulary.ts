// One vocabulary for the whole product: the client, the API, the services and the
// database all use these codes. Extend them; do not rename them casually.

export const organizationKinds = ['partner', 'lab', 'network'] as const;
export type OrganizationKind = (typeof organizationKinds)[number];

export const roles = [
  'partner_admin',
  'partner_staff',
  'shipping_clerk',
  'lab_technician',
  'lab_manager',
  'network_admin',
] as const;
export type Role = (typeof roles)[number];

/** Which organisation kind each role belongs to. */
export const roleOrganizationKind: Record<Role, OrganizationKind> = {
  partner_admin: 'partner',
  partner_staff: 'partner',
  shipping_clerk: 'lab',
  lab_technician: 'lab',
  lab_manager: 'lab',
  network_admin: 'network',
};

export const roleLabels: Record<Role, string> = {
  partner_admin: 'Shop admin',
  partner_staff: 'Shop staff',
  shipping_clerk: 'Shipping clerk',
  lab_technician: 'Lab technician',
  lab_manager: 'Lab manager',
  network_admin: 'Network admin',
};

export const mediaTypes = [
  'hdd_3_5',
  'hdd_2_5',
  'ssd_sata',
  'ssd_m2_nvme',
  'usb_flash',
  'memory_card',
  'phone',
  'tablet',
  'raid_nas',
  'tape',
  'other',
] as const;
export type MediaType = (typeof mediaTypes)[number];

export const mediaTypeLabels: Record<MediaType, string> = {
  hdd_3_5: '3.5″ hard drive',
  hdd_2_5: '2.5″ hard drive',
  ssd_sata: 'SATA SSD',
  ssd_m2_nvme: 'M.2 NVMe SSD',
  usb_flash: 'USB flash drive',
  memory_card: 'Memory card',
  phone: 'Phone',
  tablet: 'Tablet',
  raid_nas: 'RAID / NAS',
  tape: 'Tape',
  other: 'Other',
};

export const symptoms = [
  'clicking',
  'not_spinning',
  'beeping',
  'burnt_smell',
  'not_detected',
  'slow_or_freezing',
  'dropped',
  'liquid_damage',
  'fire_damage',
  'deleted_files',
  'formatted',
  'encrypted',
  'physically_broken',
  'wont_boot',
  'no_power',
] as const;
export type Symptom = (typeof symptoms)[number];

export const symptomLabels: Record<Symptom, string> = {
  clicking: 'Clicking or ticking',
  not_spinning: 'Not spinning',
  beeping: 'Beeping or buzzing',
  burnt_smell: 'Burnt smell',
  not_detected: 'Not detected by the computer',
  slow_or_freezing: 'Slow or freezing',
  dropped: 'Dropped',
  liquid_damage: 'Liquid damage',
  fire_damage: 'Fire or heat damage',
  deleted_files: 'Files deleted',
  formatted: 'Formatted',
  encrypted: 'Encrypted',
  physically_broken: 'Physically broken',
  wont_boot: 'Will not boot',
  no_power: 'No power',
};

export const labSkills = [
  'logical',
  'hdd_electronics',
  'hdd_firmware',
  'hdd_head_swap',
  'hdd_platter_work',
  'ssd_controller',
  'flash_chip_off',
  'monolith_flash',
  'phone_board',
  'phone_chip_off',
  'raid_rebuild',
  'tape',
  'liquid_remediation',
  'encrypted_volumes',
  'forensic_custody',
] as const;
export type LabSkill = (typeof labSkills)[number];

export const labSkillLabels: Record<LabSkill, string> = {
  logical: 'Logical recovery',
  hdd_electronics: 'HDD electronics (PCB, TVS, motor driver)',
  hdd_firmware: 'HDD firmware and service area',
  hdd_head_swap: 'Head swap',
  hdd_platter_work: 'Platter work (stuck spindle, platter transplant)',
  ssd_controller: 'SSD controller and firmware',
  flash_chip_off: 'Flash chip-off',
  monolith_flash: 'Monolithic flash',
  phone_board: 'Phone board repair',
  phone_chip_off: 'Phone chip-off',
  raid_rebuild: 'RAID rebuild',
  tape: 'Tape',
  liquid_remediation: 'Liquid damage remediation',
  encrypted_volumes: 'Encrypted volumes',
  forensic_custody: 'Forensic chain of custody',
};

/** Skills that open a drive's head-disk assembly and therefore need a clean-air work area. */
export const cleanAirSkills: readonly LabSkill[] = ['hdd_head_swap', 'hdd_platter_work'];

export const sensitivityFlags = ['health_records', 'legal_evidence', 'financial', 'none'] as const;
export type SensitivityFlag = (typeof sensitivityFlags)[number];

export const sensitivityLabels: Record<SensitivityFlag, string> = {
  health_records: 'Health records',
  legal_evidence: 'Legal evidence',
  financial: 'Financial',
  none: 'None',
};

export const priorityCategories = [
  'photos',
  'videos',
  'documents',
  'spreadsheets',
  'email',
  'accounting',
  'design_files',
  'source_code',
  'databases',
  'other',
] as const;
export type PriorityCategory = (typeof priorityCategories)[number];

export const priorityCategoryLabels: Record<PriorityCategory, string> = {
  photos: 'Photos',
  videos: 'Videos',
  documents: 'Documents',
  spreadsheets: 'Spreadsheets',
  email: 'E-mail',
  accounting: 'Accounting data',
  design_files: 'Design files',
  source_code: 'Source code',
  databases: 'Databases',
  other: 'Other',
};

export const batteryConditions = ['intact', 'swollen', 'damaged', 'leaking'] as const;
export type BatteryCondition = (typeof batteryConditions)[number];

/** Media that usually carry a lithium battery, so intake asks for a battery declaration. */
export const batteryMediaTypes: readonly MediaType[] = ['phone', 'tablet', 'other'];

// The life of a case. Side exits: no_recovery, cancelled, on_hold.
export const caseStatuses = [
  'opened',
  'needs_attention',
  'offered',
  'accepted',
  'label_issued',
  'in_transit',
  'received',
  'evaluating',
  'quote_sent',
  'quote_declined',
  'approved',
  'recovering',
  'ready_for_review',
  'paid',
  'returned',
  'closed',
  'no_recovery',
  'cancelled',
  'on_hold',
] as const;
export type CaseStatus = (typeof caseStatuses)[number];

export const caseStatusLabels: Record<CaseStatus, string> = {
  opened: 'Opened',
  needs_attention: 'Needs network attention',
  offered: 'Offered to a lab',
  accepted: 'Accepted by lab',
  label_issued: 'Label issued',
  in_transit: 'In transit',
  received: 'Received at lab',
  evaluating: 'Evaluating',
  quote_sent: 'Quote sent',
  quote_declined: 'Quote declined',
  approved: 'Approved',
  recovering: 'Recovering',
  ready_for_review: 'Ready for review',
  paid: 'Paid',
  returned: 'Shipped back',
  closed: 'Closed',
  no_recovery: 'No recovery possible',
  cancelled: 'Cancelled',
  on_hold: 'On hold',
};
