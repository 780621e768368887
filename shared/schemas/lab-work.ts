import { z } from 'zod';
import type { FileState } from '../domain/file-categories';
import { formatMoney } from '../domain/money';
import { batteryConditions, caseStatuses, labSkills, mediaTypes, priorityCategories, sensitivityFlags, symptoms } from '../vocabulary';
import { cautionSchema, timelineEntryDto } from './referrals';

// The lab's work on a received case: the bench queue, the evaluation, imaging progress, the
// recovered-file manifest and the quote. The technician's and the manager's forms, the routes
// and the services all use these.

const trimmed = (max: number) => z.string().trim().max(max, `Use at most ${max} characters`);
const optionalText = (max: number) => trimmed(max).optional();

// ---------------------------------------------------------------------------------------------------
// Evaluation

/** The parts a technician examines; not every part exists on every medium (an SSD has no heads). */
export const evaluationParts = ['heads', 'electronics', 'firmware', 'surface', 'controller', 'memory_chips', 'board'] as const;
export type EvaluationPart = (typeof evaluationParts)[number];

export const evaluationPartLabels: Record<EvaluationPart, string> = {
  heads: 'Read/write heads',
  electronics: 'Drive electronics (PCB)',
  firmware: 'Firmware and service area',
  surface: 'Platter surface',
  controller: 'Controller',
  memory_chips: 'Memory chips',
  board: 'Logic board (phones, tablets)',
};

export const partConditions = ['ok', 'degraded', 'failed', 'not_applicable', 'not_checked'] as const;
export type PartCondition = (typeof partConditions)[number];

export const partConditionLabels: Record<PartCondition, string> = {
  ok: 'Working',
  degraded: 'Degraded',
  failed: 'Failed',
  not_applicable: 'Not on this device',
  not_checked: 'Not checked',
};

export const recoverabilityLevels = ['high', 'partial', 'low', 'none'] as const;
export type Recoverability = (typeof recoverabilityLevels)[number];

export const recoverabilityLabels: Record<Recoverability, string> = { high: 'High', partial: 'Partial', low: 'Low', none: 'None' };

/** What each level means, in words for the customer as much as the lab. */
export const recoverabilityHints: Record<Recoverability, string> = {
  high: 'most or all of the data is expected back',
  partial: 'some of the data is expected back',
  low: 'little of the data is expected back',
  none: 'no recovery is possible',
};

export const findingSchema = z.object({
  part: z.enum(evaluationParts, { message: `Choose one of: ${evaluationParts.join(', ')}` }),
  condition: z.enum(partConditions, { message: `Choose one of: ${partConditions.join(', ')}` }),
  note: optionalText(1000),
});
export type Finding = z.infer<typeof findingSchema>;

export const evaluationInput = z
  .object({
    findings: z.array(findingSchema).min(1, 'Record at least one finding').max(evaluationParts.length),
    recoverability: z.enum(recoverabilityLevels, { message: 'Choose how much data can be recovered' }),
    plan: trimmed(4000).min(1, 'Describe the plan (or, for no recovery, why not)'),
  })
  .superRefine((e, ctx) => {
    const seen = new Set<string>();
    e.findings.forEach((f, i) => {
      if (seen.has(f.part)) ctx.addIssue({ code: 'custom', path: ['findings', i, 'part'], message: 'Each part once' });
      seen.add(f.part);
      if (f.condition === 'failed' && !f.note) {
        ctx.addIssue({ code: 'custom', path: ['findings', i, 'note'], message: 'Say what failed, in a few words' });
      }
    });
    if (!e.findings.some((f) => f.condition === 'ok' || f.condition === 'degraded' || f.condition === 'failed')) {
      ctx.addIssue({ code: 'custom', path: ['findings'], message: 'Record the condition of at least one part you examined' });
    }
  });
export type EvaluationInput = z.input<typeof evaluationInput>;

export const evaluationDto = z.object({
  findings: z.array(z.object({ part: z.enum(evaluationParts), condition: z.enum(partConditions), note: z.string().nullable() })),
  recoverability: z.enum(recoverabilityLevels),
  plan: z.string(),
  recordedAt: z.string(),
  recordedBy: z.string(),
});
export type EvaluationDto = z.infer<typeof evaluationDto>;

// ---------------------------------------------------------------------------------------------------
// Imaging progress

const wholeBytes = (what: string) =>
  z
    .number({ message: `${what} must be a number of bytes` })
    .int(`${what} must be a whole number of bytes`)
    .min(0, `${what} cannot be negative`)
    .max(Number.MAX_SAFE_INTEGER, `${what} is too large`);

/** What the technician or the lab's imaging tool reports; the server works out the rest. */
export const imagingReportInput = z
  .object({
    bytesRead: wholeBytes('Bytes read'),
    /** The source drive's exact size; defaults to the capacity given at intake (SI: 1 GB = 10^9 bytes). */
    totalBytes: wholeBytes('Total bytes').positive('Total bytes must be more than 0').optional(),
    unreadableSectors: z.number().int('Whole sectors').min(0, 'Sectors cannot be negative').max(Number.MAX_SAFE_INTEGER).default(0),
    rateBytesPerSec: z.number({ message: 'The read rate must be a number of bytes per second' }).min(0, 'The rate cannot be negative').max(1e11, 'That rate is not believable for one drive'),
    sectorSizeBytes: z.union([z.literal(512), z.literal(4096)], { message: 'Sector size is 512 or 4096 bytes' }).default(512),
  })
  .superRefine((r, ctx) => {
    if (r.totalBytes !== undefined && r.bytesRead > r.totalBytes) {
      ctx.addIssue({ code: 'custom', path: ['bytesRead'], message: 'Bytes read cannot exceed the total' });
    }
    if (r.unreadableSectors * r.sectorSizeBytes > r.bytesRead) {
      ctx.addIssue({ code: 'custom', path: ['unreadableSectors'], message: 'More unreadable sectors than bytes read' });
    }
  });
export type ImagingReportInput = z.input<typeof imagingReportInput>;

export const imagingDto = z.object({
  totalBytes: z.number(),
  bytesRead: z.number(),
  copiedBytes: z.number(),
  unreadableSectors: z.number(),
  unreadableBytes: z.number(),
  rateBytesPerSec: z.number(),
  percent: z.number(),
  /** Null when the imager is stalled (rate 0) with bytes left: no honest estimate. */
  remainingSeconds: z.number().nullable(),
  /** Expected finish, counted from the time of the report. */
  eta: z.string().nullable(),
  reportedAt: z.string(),
  finished: z.boolean(),
  reportedBy: z.string(),
});
export type ImagingDto = z.infer<typeof imagingDto>;

// ---------------------------------------------------------------------------------------------------
// Recovered-file manifest

/** A manifest CSV: `path,size,state` (RFC 4180). The limit keeps one upload in memory comfortably. */
export const MANIFEST_MAX_BYTES = 20 * 1024 * 1024;
/** File names shown per category so the customer can recognise their files. */
export const MANIFEST_EXAMPLES_PER_CATEGORY = 6;

/**
 * The manifest's file states (the same codes as shared/domain/file-categories.ts, which is not imported
 * at run time here so that the client's screens do not carry mime-db).
 */
export const fileStates = ['intact', 'partial', 'unreadable'] as const satisfies readonly FileState[];

export const fileStateLabels: Record<FileState, string> = {
  intact: 'Intact',
  partial: 'Partly readable',
  unreadable: 'Unreadable',
};

export const manifestCategoryDto = z.object({
  category: z.enum(priorityCategories),
  /** Position in the customer's priorities (0 = most important); null when the customer did not name it. */
  priority: z.number().int().nullable(),
  note: z.string().nullable(),
  files: z.number().int(),
  bytes: z.number(),
  intact: z.number().int(),
  partial: z.number().int(),
  unreadable: z.number().int(),
  examples: z.array(z.object({ path: z.string(), state: z.enum(fileStates) })),
});
export type ManifestCategoryDto = z.infer<typeof manifestCategoryDto>;

export const reviewStatuses = ['pending', 'confirmed', 'disputed'] as const;
export type ReviewStatus = (typeof reviewStatuses)[number];

export const manifestDto = z.object({
  id: z.string().uuid(),
  version: z.number().int(),
  uploadedAt: z.string(),
  uploadedBy: z.string(),
  fileCount: z.number().int(),
  totalBytes: z.number(),
  /** The customer's priorities first, in their order, then the other categories that have files. */
  categories: z.array(manifestCategoryDto),
  review: z.object({ status: z.enum(reviewStatuses), at: z.string().nullable(), note: z.string().nullable() }),
});
export type ManifestDto = z.infer<typeof manifestDto>;

// ---------------------------------------------------------------------------------------------------
// Quote

export const QUOTE_CURRENCY = 'USD';
/** The smallest card charge the payment provider accepts (from memory of its docs: $0.50 in USD). */
export const MINIMUM_QUOTE_MINOR = 50;

export const quoteLineKinds = ['service', 'target_media', 'return_shipping', 'expedite'] as const;
export type QuoteLineKind = (typeof quoteLineKinds)[number];

export const quoteLineKindLabels: Record<QuoteLineKind, string> = {
  service: 'Recovery work',
  target_media: 'New media for your data',
  return_shipping: 'Return shipping',
  expedite: 'Expedited service',
};

/** Quote lines that pay for the lab's work (and so count as service lines for the money side). */
export const serviceLineKinds: readonly QuoteLineKind[] = ['service', 'expedite'];

export const quoteLineInput = z.object({
  kind: z.enum(quoteLineKinds, { message: `Choose one of: ${quoteLineKinds.join(', ')}` }),
  /** The skill a service line pays for; only on service lines. */
  skill: z.enum(labSkills, { message: 'Choose the skill this work needs' }).optional(),
  description: trimmed(200).min(1, 'Describe the line'),
  amountMinor: z.number({ message: 'Enter an amount' }).int('Whole cents').min(0, 'Amounts cannot be negative').max(100_000_000, 'That amount is too large'),
});
export type QuoteLineInput = z.infer<typeof quoteLineInput>;

/** The rules a quote's lines follow, shared by the API schema and the manager's form (where amounts are text). */
export function checkQuoteLines(
  lines: readonly { kind: QuoteLineKind; skill?: string | undefined; amountMinor: number }[],
  ctx: z.RefinementCtx,
  amountField: string,
): void {
  const count = (kind: QuoteLineKind) => lines.filter((l) => l.kind === kind).length;
  if (count('service') === 0) ctx.addIssue({ code: 'custom', path: ['lines'], message: 'Add at least one line for the recovery work' });
  if (count('target_media') !== 1) ctx.addIssue({ code: 'custom', path: ['lines'], message: 'Add exactly one line for the new media the data returns on' });
  if (count('return_shipping') !== 1) ctx.addIssue({ code: 'custom', path: ['lines'], message: 'Add exactly one return shipping line (it may be 0.00)' });
  if (count('expedite') > 1) ctx.addIssue({ code: 'custom', path: ['lines'], message: 'At most one expedite line' });
  lines.forEach((line, i) => {
    if (line.kind === 'service' && !line.skill) ctx.addIssue({ code: 'custom', path: ['lines', i, 'skill'], message: 'Choose the skill this work needs' });
    if (line.kind !== 'service' && line.skill) ctx.addIssue({ code: 'custom', path: ['lines', i, 'skill'], message: 'Only recovery-work lines name a skill' });
    if ((line.kind === 'service' || line.kind === 'expedite') && line.amountMinor === 0) {
      ctx.addIssue({ code: 'custom', path: ['lines', i, amountField], message: 'Work lines need an amount above 0' });
    }
  });
  const total = lines.reduce((sum, l) => sum + l.amountMinor, 0);
  if (lines.length > 0 && total < MINIMUM_QUOTE_MINOR) {
    ctx.addIssue({ code: 'custom', path: ['lines'], message: 'A quote must total at least $0.50, the smallest card payment' });
  }
}

export const sendQuoteInput = z
  .object({
    currency: z.literal(QUOTE_CURRENCY, { message: 'Quotes are in US dollars (USD) for now' }).default(QUOTE_CURRENCY),
    lines: z.array(quoteLineInput).min(1, 'Add the quote’s lines').max(30, 'At most 30 lines'),
    note: optionalText(2000),
  })
  .superRefine((q, ctx) => checkQuoteLines(q.lines, ctx, 'amountMinor'));
export type SendQuoteInput = z.input<typeof sendQuoteInput>;

/** A decimal amount as people type it: "450", "450.5", "450.50". */
const decimalAmount = z
  .string()
  .trim()
  .regex(/^\d{1,6}(\.\d{1,2})?$/, 'Enter an amount in dollars, such as 450 or 450.00');

/** The manager's quote form: the same rules with amounts typed in dollars; `toSendQuoteInput` converts. */
export const quoteFormSchema = z
  .object({
    lines: z
      .array(
        z.object({
          kind: z.enum(quoteLineKinds),
          skill: z.union([z.enum(labSkills), z.literal('')]).optional(),
          description: trimmed(200).min(1, 'Describe the line'),
          amount: decimalAmount,
        }),
      )
      .min(1, 'Add the quote’s lines')
      .max(30, 'At most 30 lines'),
    note: optionalText(2000),
  })
  .superRefine((q, ctx) => {
    const parsed = q.lines.map((l) => ({ kind: l.kind, skill: l.skill || undefined, amountMinor: dollarsToCents(l.amount) ?? 0 }));
    checkQuoteLines(parsed, ctx, 'amount');
  });
export type QuoteFormValues = z.input<typeof quoteFormSchema>;

/** "450.5" → 45050; null when the text is not an amount. Exact: no floating point. */
export function dollarsToCents(text: string): number | null {
  const m = /^(\d{1,9})(?:\.(\d{1,2}))?$/.exec(text.trim());
  if (!m) return null;
  return Number(m[1]) * 100 + Number((m[2] ?? '').padEnd(2, '0'));
}

export function toSendQuoteInput(values: z.output<typeof quoteFormSchema>): z.output<typeof sendQuoteInput> {
  return {
    currency: QUOTE_CURRENCY,
    lines: values.lines.map((l) => ({
      kind: l.kind,
      ...(l.skill ? { skill: l.skill } : {}),
      description: l.description,
      amountMinor: dollarsToCents(l.amount) ?? 0,
    })),
    ...(values.note ? { note: values.note } : {}),
  };
}

export const quoteStatuses = ['sent', 'approved', 'declined', 'superseded'] as const;
export type QuoteStatus = (typeof quoteStatuses)[number];

export const quoteDto = z.object({
  id: z.string().uuid(),
  version: z.number().int(),
  status: z.enum(quoteStatuses),
  currency: z.string(),
  lines: z.array(z.object({ kind: z.enum(quoteLineKinds), skill: z.enum(labSkills).nullable(), description: z.string(), amountMinor: z.number().int() })),
  totalMinor: z.number().int(),
  serviceLinesMinor: z.number().int(),
  note: z.string().nullable(),
  sentAt: z.string(),
  sentBy: z.string(),
  approval: z.object({ at: z.string(), fullName: z.string() }).nullable(),
  decline: z.object({ at: z.string(), reason: z.string().nullable() }).nullable(),
});
export type QuoteDto = z.infer<typeof quoteDto>;

// ---------------------------------------------------------------------------------------------------
// Payment, as the lab and the shop see it

export const paymentStates = ['unpaid', 'paid'] as const;
export const paymentDto = z.object({
  state: z.enum(paymentStates),
  amountMinor: z.number().int().nullable(),
  currency: z.string().nullable(),
  paidAt: z.string().nullable(),
  /** The last declined attempt, in the provider's words, while unpaid. */
  lastFailure: z.string().nullable(),
  /** What has been given back to the customer so far (0 while unpaid). */
  refundedMinor: z.number().int(),
});
export type PaymentDto = z.infer<typeof paymentDto>;

// ---------------------------------------------------------------------------------------------------
// Refund: the lab manager gives the customer back all or part of what was paid

export const refundReasons = ['recovery_failed', 'partial_recovery', 'customer_request', 'charged_twice', 'other'] as const;
export type RefundReason = (typeof refundReasons)[number];

export const refundReasonLabels: Record<RefundReason, string> = {
  recovery_failed: 'The files could not be recovered',
  partial_recovery: 'Only part of what was promised was recovered',
  customer_request: 'The customer asked for it',
  charged_twice: 'The customer was charged twice',
  other: 'Another reason (say which)',
};

/** The rule the API schema and the manager's form share: "another reason" needs the reason written. */
function checkRefundNote(v: { reason: string; note?: string | undefined }, ctx: z.RefinementCtx): void {
  if (v.reason === 'other' && !v.note) ctx.addIssue({ code: 'custom', path: ['note'], message: 'Say why the money goes back' });
}

export const refundInput = z
  .object({
    /** In cents; without it, everything not yet refunded. */
    amountMinor: z.number({ message: 'Enter an amount' }).int('Whole cents').min(1, 'Refund at least one cent').optional(),
    reason: z.enum(refundReasons, { message: `Choose one of: ${refundReasons.join(', ')}` }),
    note: trimmed(500).optional(),
  })
  .superRefine(checkRefundNote);
export type RefundInput = z.infer<typeof refundInput>;

/** The manager's refund form, amounts typed in dollars; at most `leftMinor`, what has not been refunded yet. */
export function refundFormSchema(leftMinor: number, currency: string) {
  return z
    .object({
      amount: decimalAmount,
      reason: z.union([z.enum(refundReasons), z.literal('')]),
      note: trimmed(500),
    })
    .superRefine((v, ctx) => {
      const cents = dollarsToCents(v.amount);
      if (cents !== null && cents < 1) ctx.addIssue({ code: 'custom', path: ['amount'], message: 'Refund at least one cent' });
      if (cents !== null && cents > leftMinor) ctx.addIssue({ code: 'custom', path: ['amount'], message: `At most ${formatMoney(leftMinor, currency)} is left to refund` });
      if (v.reason === '') ctx.addIssue({ code: 'custom', path: ['reason'], message: 'Choose a reason' });
      checkRefundNote(v, ctx);
    });
}
export type RefundFormValues = z.input<ReturnType<typeof refundFormSchema>>;

export function toRefundInput(values: z.output<ReturnType<typeof refundFormSchema>>): RefundInput {
  return { amountMinor: dollarsToCents(values.amount)!, reason: values.reason as RefundReason, ...(values.note ? { note: values.note } : {}) };
}

export const returnAddressDto = z.object({
  name: z.string(),
  line1: z.string(),
  line2: z.string().nullable(),
  city: z.string(),
  region: z.string(),
  postalCode: z.string(),
  country: z.string(),
  phone: z.string().nullable(),
  updatedAt: z.string(),
});
export type ReturnAddressDto = z.infer<typeof returnAddressDto>;

// ---------------------------------------------------------------------------------------------------
// The bench queue and the lab's case page

/** Statuses in which a case is on the lab's bench (received and not yet shipped back). */
export const benchStatuses = ['received', 'evaluating', 'quote_sent', 'quote_declined', 'approved', 'paid', 'recovering', 'ready_for_review'] as const;

export const benchQuery = z.object({
  status: z.enum(benchStatuses).optional(),
});

export const benchRowDto = z.object({
  id: z.string().uuid(),
  reference: z.string(),
  status: z.enum(caseStatuses),
  shopName: z.string(),
  customerName: z.string(),
  mediaType: z.enum(mediaTypes),
  device: z.string(),
  capacityGb: z.number().nullable(),
  symptoms: z.array(z.enum(symptoms)),
  requiredSkills: z.array(z.enum(labSkills)),
  cautions: z.array(cautionSchema),
  priorities: z.array(z.object({ category: z.enum(priorityCategories), note: z.string().nullable() })),
  photos: z.array(z.object({ id: z.string().uuid(), url: z.string() })),
  /** When the network told the shop to expect the data: the accepted offer's estimate from its acceptance. */
  promisedBy: z.string().nullable(),
  receivedAt: z.string().nullable(),
  imagingPercent: z.number().nullable(),
  reviewStatus: z.enum(reviewStatuses).nullable(),
  updatedAt: z.string(),
});
export type BenchRowDto = z.infer<typeof benchRowDto>;

export const benchListDto = z.object({ data: z.array(benchRowDto) });

export const labCaseDto = z.object({
  id: z.string().uuid(),
  reference: z.string(),
  status: z.enum(caseStatuses),
  shop: z.object({ name: z.string(), phone: z.string().nullable() }),
  customerName: z.string(),
  device: z.object({
    mediaType: z.enum(mediaTypes),
    capacityGb: z.number().nullable(),
    interface: z.string().nullable(),
    make: z.string().nullable(),
    model: z.string().nullable(),
    serial: z.string().nullable(),
    memberCount: z.number().nullable(),
  }),
  symptoms: z.array(z.enum(symptoms)),
  description: z.string().nullable(),
  priorities: z.array(z.object({ category: z.enum(priorityCategories), note: z.string().nullable() })),
  sensitivity: z.array(z.enum(sensitivityFlags)),
  battery: z.object({ installed: z.boolean(), condition: z.enum(batteryConditions).nullable(), wattHours: z.number().nullable() }).nullable(),
  requiredSkills: z.array(z.enum(labSkills)),
  needsCleanAir: z.boolean(),
  cautions: z.array(cautionSchema),
  photos: z.array(z.object({ id: z.string().uuid(), url: z.string() })),
  promisedBy: z.string().nullable(),
  timeline: z.array(timelineEntryDto),
  evaluation: evaluationDto.nullable(),
  quote: quoteDto.nullable(),
  imaging: imagingDto.nullable(),
  manifest: manifestDto.nullable(),
  payment: paymentDto,
  returnAddress: returnAddressDto.nullable(),
});
export type LabCaseDto = z.infer<typeof labCaseDto>;

// ---------------------------------------------------------------------------------------------------
// The shop's view of the lab's work, and the customer link as the shop manages it

export const customerLinkDto = z.object({
  id: z.string().uuid(),
  issuedAt: z.string(),
  issuedBy: z.string(),
  reason: z.string(),
  expiresAt: z.string(),
  lastUsedAt: z.string().nullable(),
  revokedAt: z.string().nullable(),
});
export type CustomerLinkDto = z.infer<typeof customerLinkDto>;

export const shopLabWorkDto = z.object({
  status: z.enum(caseStatuses),
  evaluation: z.object({ recoverability: z.enum(recoverabilityLevels), recordedAt: z.string() }).nullable(),
  quote: quoteDto.nullable(),
  imaging: imagingDto.nullable(),
  manifest: manifestDto.omit({ categories: true }).extend({ categories: z.array(manifestCategoryDto.omit({ examples: true })) }).nullable(),
  payment: paymentDto,
});
export type ShopLabWorkDto = z.infer<typeof shopLabWorkDto>;

export const customerLinkListDto = z.object({ data: z.array(customerLinkDto) });

export const issueCustomerLinkInput = z.object({
  /** Also e-mail the new link to the customer. */
  sendEmail: z.boolean().default(false),
});

/** The answer to issuing a link: the only time its address is shown. */
export const issuedCustomerLinkDto = z.object({ link: customerLinkDto, url: z.string() });
export type IssuedCustomerLinkDto = z.infer<typeof issuedCustomerLinkDto>;

// ---------------------------------------------------------------------------------------------------
// Lab tooling keys (the lab's imaging tools post progress and manifests with them)

export const createLabKeyInput = z.object({
  name: z.string({ message: 'Name the key after the tool that will use it' }).trim().min(1, 'Name the key after the tool that will use it').max(80, 'Use at most 80 characters'),
});
