import { z } from 'zod';
import { custodyActions } from '../domain/custody-chain';

// The custody log of a case's original media, as the API answers it and as the signed export states it.

// The same kinds of actor as the case timeline, so a component passes its timeline actor along.
export const custodyActorTypes = ['user', 'api_key', 'system', 'carrier', 'customer'] as const;
export type CustodyActorType = (typeof custodyActorTypes)[number];

const hash = z.string().regex(/^[0-9a-f]{64}$/, 'A SHA-256 hash in lower-case hex');

export const custodyEntryDto = z.object({
  id: z.string().uuid(),
  /** 1 for the first entry of the case, then +1 per entry. */
  sequence: z.number().int().min(1),
  action: z.enum(custodyActions),
  at: z.string(),
  actor: z.object({ type: z.enum(custodyActorTypes), id: z.string().nullable(), name: z.string() }),
  /** Where it happened: the shop, the carrier's network, the lab and its bench. */
  location: z.string().nullable(),
  details: z.record(z.string(), z.unknown()),
  previousHash: hash.nullable(),
  hash,
});
export type CustodyEntryDto = z.infer<typeof custodyEntryDto>;

export const chainVerificationDto = z.discriminatedUnion('intact', [
  z.object({ intact: z.literal(true) }),
  z.object({ intact: z.literal(false), firstBrokenSequence: z.number().int(), reason: z.string() }),
]);
export type ChainVerificationDto = z.infer<typeof chainVerificationDto>;

export const custodyLogDto = z.object({
  referral: z.object({ id: z.string().uuid(), reference: z.string(), legalEvidence: z.boolean() }),
  /** Oldest first. */
  entries: z.array(custodyEntryDto),
  /** The last entry's hash, or null while the log is empty. */
  headHash: hash.nullable(),
  /** Every hash recomputed from the stored entries just now, and the head compared with the one kept beside the log. */
  verification: chainVerificationDto,
  checkedAt: z.string(),
  /** Legal-evidence cases export the log as a signed PDF. */
  signedExportAvailable: z.boolean(),
});
export type CustodyLogDto = z.infer<typeof custodyLogDto>;

/** Steps a lab records by hand: handling inside the lab that no other system sees. */
export const manualCustodyActions = ['to_clean_bench', 'imaged'] as const;

const text = (max: number) => z.string().trim().max(max, `Use at most ${max} characters`);

export const appendCustodyInput = z.object({
  action: z.enum(manualCustodyActions, { message: `Choose one of: ${manualCustodyActions.join(', ')}` }),
  location: text(200).min(1, 'Say where the device is (the room, bench or rack)'),
  note: text(1000).optional(),
});
export type AppendCustodyInput = z.infer<typeof appendCustodyInput>;

export const custodySigningKeyDto = z.object({
  algorithm: z.literal('Ed25519'),
  /** First 16 hex digits of the SHA-256 of the public key (SubjectPublicKeyInfo, DER). */
  keyId: z.string(),
  publicKeyPem: z.string(),
  /** True when no CUSTODY_SIGNING_KEY was configured and the server made one at start. */
  development: z.boolean(),
});
export type CustodySigningKeyDto = z.infer<typeof custodySigningKeyDto>;

/** What an export signs. The PDF prints these fields and the signature; the response repeats them in headers. */
export const custodyStatementSchema = z.object({
  referralId: z.string().uuid(),
  reference: z.string().min(1).max(40),
  entryCount: z.number().int().min(1),
  headHash: hash,
  exportedAt: z.string().datetime({ offset: true, message: 'Use an ISO 8601 date-time' }),
});
export type CustodyStatement = z.infer<typeof custodyStatementSchema>;

/** The exact bytes signed with Ed25519 (UTF-8): one field per line, in this order. */
export function custodyStatementText(s: CustodyStatement): string {
  return [
    'Platterpost custody log export v1',
    `case: ${s.referralId}`,
    `reference: ${s.reference}`,
    `entries: ${s.entryCount}`,
    `head-sha256: ${s.headHash}`,
    `exported-at: ${s.exportedAt}`,
    '',
  ].join('\n');
}

export const verifyCustodySignatureInput = custodyStatementSchema.extend({
  /** Base64 of the 64-byte Ed25519 signature. */
  signature: z.string().regex(/^[A-Za-z0-9+/]{86}==$/, 'A base64 Ed25519 signature (88 characters)'),
});
export type VerifyCustodySignatureInput = z.infer<typeof verifyCustodySignatureInput>;

export const custodySignatureCheckDto = z.object({
  /** The signature matches the statement under the server's key. */
  signatureValid: z.boolean(),
  /** The statement's head hash and entry count match the case's log as it is now (null when the signature is not valid). */
  matchesLog: z.boolean().nullable(),
  keyId: z.string(),
});
export type CustodySignatureCheckDto = z.infer<typeof custodySignatureCheckDto>;
