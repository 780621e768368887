import { z } from 'zod';
import { sanitizationLevels, sanitizationTechniques } from '../domain/sanitization';
import { caseStatuses, mediaTypes } from '../vocabulary';

// What happens to the customer's original media and any failed parts when the case closes: each
// item is returned, or sanitized by NIST SP 800-88 Rev. 1 with a certificate of sanitization.

export const dispositionItems = ['original_media', 'failed_part'] as const;
export type DispositionItem = (typeof dispositionItems)[number];
export const dispositionItemLabels: Record<DispositionItem, string> = {
  original_media: 'Original media',
  failed_part: 'Failed part',
};

export const dispositionOutcomes = ['returned', 'sanitized'] as const;
export type DispositionOutcome = (typeof dispositionOutcomes)[number];
export const dispositionOutcomeLabels: Record<DispositionOutcome, string> = {
  returned: 'Returned',
  sanitized: 'Sanitized',
};

export const returnRecipients = ['shop', 'customer'] as const;
export type ReturnRecipient = (typeof returnRecipients)[number];

/**
 * How the result was checked. NIST SP 800-88 Rev. 1 §4.7 (from memory) asks for verification after
 * every sanitization: a full read-back of the media, or a representative sample of it, for Clear and
 * Purge; an inspection of what is left for Destroy.
 */
export const verificationMethods = ['full_read_back', 'sampled_read_back', 'tool_report', 'visual_inspection'] as const;
export type VerificationMethod = (typeof verificationMethods)[number];
export const verificationMethodLabels: Record<VerificationMethod, string> = {
  full_read_back: 'Full read-back of the media',
  sampled_read_back: 'Read-back of a representative sample',
  tool_report: 'Verification report of the sanitizing tool',
  visual_inspection: 'Inspection of the remains (particle size, no whole chips or platter pieces)',
};

/** Case statuses in which the media can be disposed of: the work on the device is over. */
export const disposableStatuses = ['returned', 'no_recovery', 'quote_declined'] as const satisfies readonly (typeof caseStatuses)[number][];
/** Failed parts may still be recorded after the original media closed the case. */
export const failedPartStatuses = [...disposableStatuses, 'closed'] as const satisfies readonly (typeof caseStatuses)[number][];

const text = (max: number) => z.string().trim().max(max, `Use at most ${max} characters`);
const optionalText = (max: number) =>
  text(max)
    .optional()
    .transform((v) => (v ? v : undefined));

const itemFields = {
  item: z.enum(dispositionItems, { message: 'Choose the original media or a failed part' }),
  description: text(200).min(1, 'Describe the item (make, model, what it is)'),
  serialNumber: optionalText(80),
  /** Defaults to the case's media type; a RAID's member drive or a failed part names its own. */
  mediaType: z.enum(mediaTypes).optional(),
  note: optionalText(1000),
};

export const returnedDispositionInput = z.object({
  outcome: z.literal('returned'),
  ...itemFields,
  returnedTo: z.enum(returnRecipients, { message: 'Choose who receives it' }),
  trackingCode: optionalText(60),
});

export const sanitizedDispositionInput = z.object({
  outcome: z.literal('sanitized'),
  ...itemFields,
  level: z.enum(sanitizationLevels, { message: 'Choose clear, purge or destroy' }),
  technique: z.enum(sanitizationTechniques, { message: 'Choose the technique' }),
  /** The technician has confirmed the device encrypts all stored data itself. */
  selfEncrypting: z.boolean().default(false),
  /** The overwrite ran as the drive's own sanitize or secure-erase command. */
  driveCommand: z.boolean().default(false),
  /** The pattern, passes, command or particle size: "1 pass of zeros", "ATA SANITIZE CRYPTO SCRAMBLE EXT". */
  techniqueDetails: optionalText(300),
  tool: z.object({
    name: text(120).min(1, 'Name the tool or machine (make and model)'),
    version: optionalText(60),
    serialNumber: optionalText(80),
  }),
  verification: z.object({
    method: z.enum(verificationMethods, { message: 'Choose how the result was verified' }),
    note: optionalText(500),
  }),
  verified: z.literal(true, { message: 'Confirm that the verification passed; if it did not, sanitize again or destroy the media' }),
  /** Where the media goes afterwards: "e-waste recycler", "returned to the shop". */
  destination: optionalText(200),
});

export const recordDispositionInput = z.discriminatedUnion('outcome', [returnedDispositionInput, sanitizedDispositionInput], {
  message: 'Choose returned or sanitized',
});
export type RecordDispositionInput = z.input<typeof recordDispositionInput>;
export type RecordDisposition = z.output<typeof recordDispositionInput>;

export const certificateDto = z.object({
  id: z.string().uuid(),
  /** "SC-PP-…-1": the case reference and the certificate's number on that case. */
  number: z.string(),
  issuedAt: z.string(),
  /** SHA-256 of the PDF, also its storage key. */
  sha256: z.string(),
  sizeBytes: z.number().int(),
  url: z.string(),
});
export type CertificateDto = z.infer<typeof certificateDto>;

export const dispositionDto = z.object({
  id: z.string().uuid(),
  item: z.enum(dispositionItems),
  description: z.string(),
  serialNumber: z.string().nullable(),
  mediaType: z.enum(mediaTypes),
  outcome: z.enum(dispositionOutcomes),
  note: z.string().nullable(),
  returned: z.object({ to: z.enum(returnRecipients), trackingCode: z.string().nullable() }).nullable(),
  sanitization: z
    .object({
      level: z.enum(sanitizationLevels),
      technique: z.enum(sanitizationTechniques),
      techniqueDetails: z.string().nullable(),
      selfEncrypting: z.boolean(),
      driveCommand: z.boolean(),
      tool: z.object({ name: z.string(), version: z.string().nullable(), serialNumber: z.string().nullable() }),
      verification: z.object({ method: z.enum(verificationMethods), note: z.string().nullable() }),
      destination: z.string().nullable(),
      /** Why the technique reaches the level (NIST SP 800-88 Rev. 1 Appendix A, as our rules restate it). */
      basis: z.string(),
    })
    .nullable(),
  performedAt: z.string(),
  performedBy: z.object({ id: z.string().uuid(), name: z.string() }),
  lab: z.object({ id: z.string().uuid(), name: z.string() }),
  /** The custody entry this step wrote. */
  custodySequence: z.number().int(),
  certificate: certificateDto.nullable(),
});
export type DispositionDto = z.infer<typeof dispositionDto>;

export const caseDispositionDto = z.object({
  referral: z.object({
    id: z.string().uuid(),
    reference: z.string(),
    status: z.enum(caseStatuses),
    mediaType: z.enum(mediaTypes),
  }),
  /** The work on the case is over and its original media is still to be returned or sanitized (recording it closes the case). */
  acceptsOriginal: z.boolean(),
  /** Failed parts can be recorded from the end of the work until after the case has closed. */
  acceptsFailedParts: z.boolean(),
  originalDisposed: z.boolean(),
  dispositions: z.array(dispositionDto),
  certificates: z.array(certificateDto.extend({ dispositionId: z.string().uuid() })),
});
export type CaseDispositionDto = z.infer<typeof caseDispositionDto>;
