// The one key factory. Keys nest (all → lists → list(filters) → detail(id)) so that
// invalidating a parent key refreshes everything under it.

export const authKeys = {
  all: ['auth'] as const,
  me: ['auth', 'me'] as const,
  invitation: (token: string) => ['auth', 'invitation', token] as const,
};

export type CaseListFilters = Record<string, string | number | boolean | undefined>;

export const caseKeys = {
  all: ['cases'] as const,
  lists: () => [...caseKeys.all, 'list'] as const,
  list: (filters: CaseListFilters = {}) => [...caseKeys.lists(), filters] as const,
  details: () => [...caseKeys.all, 'detail'] as const,
  detail: (id: string) => [...caseKeys.details(), id] as const,
};

export const staffKeys = {
  all: ['staff'] as const,
  lists: () => [...staffKeys.all, 'list'] as const,
};

/** The intake form's live ranking; the key holds the device, symptoms and origin it was asked for. */
export const routingPreviewKeys = {
  all: ['routing-preview'] as const,
  preview: (input: unknown) => [...routingPreviewKeys.all, input] as const,
};

/** Condition photos, fetched with the bearer token and shown from object URLs. */
export const photoKeys = {
  all: ['photos'] as const,
  photo: (id: string) => [...photoKeys.all, id] as const,
};

export type OfferListFilters = Record<string, string | undefined>;

/** A lab's offers. Answering an offer also changes its case, so mutations invalidate caseKeys too. */
export const offerKeys = {
  all: ['offers'] as const,
  lists: () => [...offerKeys.all, 'list'] as const,
  list: (filters: OfferListFilters = {}) => [...offerKeys.lists(), filters] as const,
  details: () => [...offerKeys.all, 'detail'] as const,
  detail: (id: string) => [...offerKeys.details(), id] as const,
};

export const labProfileKeys = {
  all: ['lab-profile'] as const,
  own: () => [...labProfileKeys.all, 'own'] as const,
};

/** The network admin's views: the needs-attention queue and the lab list. */
export const networkKeys = {
  all: ['network'] as const,
  attention: () => [...networkKeys.all, 'attention'] as const,
  labs: () => [...networkKeys.all, 'labs'] as const,
  labList: (filters: { skill?: string } = {}) => [...networkKeys.labs(), filters] as const,
  commissionPlans: () => [...networkKeys.all, 'commission-plans'] as const,
  partners: () => [...networkKeys.all, 'partners'] as const,
};

export const apiKeyKeys = {
  all: ['api-keys'] as const,
  lists: () => [...apiKeyKeys.all, 'list'] as const,
};

export const apiDocumentKeys = {
  all: ['api-document'] as const,
};

/** Labels and tracking of one case (the shop's Ship section) and single shipments. */
export const shipmentKeys = {
  all: ['shipments'] as const,
  caseShipping: (referralId: string) => [...shipmentKeys.all, 'case', referralId] as const,
  detail: (id: string) => [...shipmentKeys.all, 'detail', id] as const,
};

export type InboundBoardFilters = { bucket?: string; q?: string };

/** The lab's boxes: the inbound board, a box looked up for check-in, and outgoing returns and transfers. */
export const inboundKeys = {
  all: ['inbound'] as const,
  board: (filters: InboundBoardFilters = {}) => [...inboundKeys.all, 'board', filters] as const,
  lookup: (code: string) => [...inboundKeys.all, 'lookup', code] as const,
  outbound: () => [...inboundKeys.all, 'outbound'] as const,
};

export const webhookKeys = {
  all: ['webhooks'] as const,
  lists: () => [...webhookKeys.all, 'list'] as const,
  deliveries: (endpointId: string) => [...webhookKeys.all, 'deliveries', endpointId] as const,
};

/** The lab's bench queue, its cases and the keys of its imaging tools. */
export const benchKeys = {
  all: ['bench'] as const,
  lists: () => [...benchKeys.all, 'list'] as const,
  list: (filters: Record<string, string | undefined> = {}) => [...benchKeys.lists(), filters] as const,
  case: (id: string) => [...benchKeys.all, 'case', id] as const,
  toolKeys: () => [...benchKeys.all, 'tool-keys'] as const,
};

/** The shop's view of the lab's work on its case, and the case's customer links. */
export const labWorkKeys = {
  all: ['lab-work'] as const,
  shop: (referralId: string) => [...labWorkKeys.all, 'shop', referralId] as const,
  links: (referralId: string) => [...labWorkKeys.all, 'links', referralId] as const,
};

/** The customer's page, by the link's token (held in memory only). */
export const customerCaseKeys = {
  all: ['customer-case'] as const,
  case: (token: string) => [...customerCaseKeys.all, token] as const,
};

/** The case record: its custody log, the disposition of its media and the certificates of sanitization. */
export const caseRecordKeys = {
  all: ['case-record'] as const,
  custody: (caseId: string) => [...caseRecordKeys.all, 'custody', caseId] as const,
  dispositions: (caseId: string) => [...caseRecordKeys.all, 'dispositions', caseId] as const,
};

export type AuditFilters = Record<string, string | undefined>;

/** The network admin's audit log and what its filters can choose from. */
export const auditKeys = {
  all: ['audit'] as const,
  lists: () => [...auditKeys.all, 'list'] as const,
  list: (filters: AuditFilters = {}) => [...auditKeys.lists(), filters] as const,
  facets: () => [...auditKeys.all, 'facets'] as const,
};

/** The signed-in person's own e-mail choices. */
export const notificationPreferenceKeys = {
  all: ['notification-preferences'] as const,
};
