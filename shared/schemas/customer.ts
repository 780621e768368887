import { z } from 'zod';
import { caseStatuses, mediaTypes, priorityCategories } from '../vocabulary';
import { imagingDto, manifestDto, paymentDto, quoteDto, recoverabilityLevels, returnAddressDto } from './lab-work';

// The customer's private page (/c/:token): no account, one case, nothing else. The token travels in
// the Authorization header as `CustomerLink <token>`, so it never appears in a request line or a log.

export const CUSTOMER_LINK_SCHEME = 'CustomerLink';

/** 32 random bytes, base64url: 256 bits, far beyond guessing. */
export const customerTokenPattern = /^[A-Za-z0-9_-]{43}$/;

const trimmed = (max: number) => z.string().trim().max(max, `Use at most ${max} characters`);

/** The words of the terms the customer agrees to when approving a quote; stored with the approval. */
export const QUOTE_TERMS_VERSION = '2025-12';

export const approveQuoteInput = z.object({
  quoteId: z.string().uuid('Reload the page: this quote is not the current one'),
  fullName: trimmed(120).min(2, 'Type your full name to approve'),
  acceptTerms: z.literal(true, { message: 'Tick the box to agree to the terms' }),
});
export type ApproveQuoteInput = z.input<typeof approveQuoteInput>;

export const declineQuoteInput = z.object({
  quoteId: z.string().uuid('Reload the page: this quote is not the current one'),
  reason: trimmed(1000).optional(),
});
export type DeclineQuoteInput = z.input<typeof declineQuoteInput>;

export const confirmCheckoutInput = z.object({
  sessionId: z.string().trim().min(1).max(200),
});

export const confirmFilesInput = z.object({
  manifestId: z.string().uuid('Reload the page: the file list has changed'),
});

export const disputeFilesInput = z.object({
  manifestId: z.string().uuid('Reload the page: the file list has changed'),
  note: trimmed(2000).min(10, 'Tell the lab what is missing or wrong, in a sentence or two'),
});
export type DisputeFilesInput = z.input<typeof disputeFilesInput>;

export const returnAddressInput = z.object({
  name: trimmed(120).min(1, 'Enter the name for the parcel'),
  line1: trimmed(200).min(1, 'Enter the street address'),
  line2: trimmed(200).optional(),
  city: trimmed(100).min(1, 'Enter the city'),
  region: trimmed(100).min(1, 'Enter the state'),
  postalCode: trimmed(20).regex(/^\d{5}(-\d{4})?$/, 'Enter a US ZIP code, like 80202'),
  country: z.literal('US', { message: 'Returns ship within the US for now' }).default('US'),
  phone: trimmed(40).regex(/^[+()0-9 .-]*$/, 'Use digits, spaces and + ( ) - . only').optional(),
});
export type ReturnAddressInput = z.input<typeof returnAddressInput>;

export const customerTimelineEntryDto = z.object({
  at: z.string(),
  kind: z.string(),
  summary: z.string(),
});

export const checkoutDto = z.object({ url: z.string().url() });

export const customerCaseDto = z.object({
  reference: z.string(),
  status: z.enum(caseStatuses),
  customerName: z.string(),
  shop: z.object({ name: z.string(), phone: z.string().nullable(), email: z.string().nullable() }),
  lab: z.object({ name: z.string() }).nullable(),
  device: z.object({ mediaType: z.enum(mediaTypes), make: z.string().nullable(), model: z.string().nullable(), capacityGb: z.number().nullable() }),
  priorities: z.array(z.object({ category: z.enum(priorityCategories), note: z.string().nullable() })),
  timeline: z.array(customerTimelineEntryDto),
  evaluation: z.object({ recoverability: z.enum(recoverabilityLevels), plan: z.string() }).nullable(),
  quote: quoteDto.nullable(),
  imaging: imagingDto.nullable(),
  files: manifestDto.nullable(),
  payment: paymentDto,
  returnAddress: returnAddressDto.nullable(),
  /** What the customer can do now; the server decides, the page only shows it. */
  actions: z.object({
    respondToQuote: z.boolean(),
    pay: z.boolean(),
    reviewFiles: z.boolean(),
    setReturnAddress: z.boolean(),
  }),
  termsVersion: z.string(),
});
export type CustomerCaseDto = z.infer<typeof customerCaseDto>;
