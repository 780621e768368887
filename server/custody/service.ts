import type { EntityManager } from 'typeorm';
import { chainHash, verifyChain, type ChainVerification, type CustodyAction, type CustodyDetailValue, type StoredCustodyEntry } from '@shared/domain/custody-chain';
import {
  appendCustodyInput,
  custodyStatementText,
  verifyCustodySignatureInput,
  type CustodyActorType,
  type CustodyEntryDto,
  type CustodyLogDto,
  type CustodySignatureCheckDto,
  type CustodyStatement,
} from '@shared/schemas/custody';
import { recordAudit } from '../audit';
import { AppError } from '../lib/errors';
import type { Actor, ServiceContext } from '../lib/context';
import { parseInput } from '../lib/validate';
import { CustodyEntryRow, CustodyHead } from './entities';
import { custodyLogPdf, type CustodyPdfCase } from './pdf';
import type { CustodySigner } from './signing';

// The custody log of a case's original media: who handled it, what they did, when and where.
// Appends for one case are serialised on the case row, so two can never share a previous hash.

const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

/** Who handled the device: the same shape as a timeline actor, so components pass theirs along. */
export interface CustodyActor {
  type: CustodyActorType;
  id?: string | null;
  name: string;
}

export interface CustodyInput {
  action: CustodyAction;
  actor: CustodyActor;
  /** Where: the shop, "in the carrier's network", the lab and its room or bench. */
  location: string | null;
  details?: Record<string, unknown>;
  /** When it happened, if not now (a carrier scan's own time). */
  at?: Date;
}

/** The actor as hashed: type, id and the name as it was at the time, so none of them can change unseen. */
function hashedActor(type: string, id: string | null, name: string): string {
  return JSON.stringify([type, id, name]);
}

function toStored(row: CustodyEntryRow): StoredCustodyEntry {
  return {
    sequence: row.sequence,
    caseId: row.referralId,
    action: row.action,
    actor: hashedActor(row.actorType, row.actorId, row.actorName),
    at: row.at,
    location: row.location,
    details: row.details as Record<string, CustodyDetailValue>,
    hash: row.hash,
  };
}

export function toCustodyEntryDto(row: CustodyEntryRow): CustodyEntryDto {
  return {
    id: row.id,
    sequence: row.sequence,
    action: row.action,
    at: row.at.toISOString(),
    actor: { type: row.actorType, id: row.actorId, name: row.actorName },
    location: row.location,
    details: row.details,
    previousHash: row.previousHash,
    hash: row.hash,
  };
}

/**
 * Appends one entry to the case's custody log in the caller's transaction. The case row is locked
 * (FOR NO KEY UPDATE: it waits for another append, not for rows that merely reference the case).
 */
export async function appendCustody(manager: EntityManager, referralId: string, input: CustodyInput): Promise<CustodyEntryDto> {
  const locked: { id: string }[] = await manager.query(`SELECT id FROM referrals WHERE id = $1 FOR NO KEY UPDATE`, [referralId]);
  if (locked.length === 0) throw AppError.notFound('That case');
  const last = await manager.findOne(CustodyEntryRow, { where: { referralId }, order: { sequence: 'DESC' } });
  const sequence = (last?.sequence ?? 0) + 1;
  // Stored in milliseconds, as hashed (the chain hashes the ISO form with milliseconds).
  const at = new Date(Math.floor((input.at ?? new Date()).getTime()));
  // What jsonb gives back: undefined members dropped, dates as strings.
  const details = JSON.parse(JSON.stringify(input.details ?? {})) as Record<string, CustodyDetailValue>;
  const actorId = input.actor.id ?? null;
  const previousHash = last?.hash ?? null;
  const hash = await chainHash(previousHash, {
    sequence,
    caseId: referralId,
    action: input.action,
    actor: hashedActor(input.actor.type, actorId, input.actor.name),
    at,
    location: input.location,
    details,
  });
  const row = manager.create(CustodyEntryRow, {
    referralId,
    sequence,
    action: input.action,
    at,
    actorType: input.actor.type,
    actorId,
    actorName: input.actor.name,
    location: input.location,
    details,
    previousHash,
    hash,
  });
  await manager.save(CustodyEntryRow, row);
  await manager.query(
    `INSERT INTO custody_heads (referral_id, sequence, head_hash) VALUES ($1, $2, $3)
     ON CONFLICT (referral_id) DO UPDATE SET sequence = EXCLUDED.sequence, head_hash = EXCLUDED.head_hash, updated_at = clock_timestamp()`,
    [referralId, sequence, hash],
  );
  return toCustodyEntryDto(row);
}

/** "Quillmark Data Recovery, Tucson, AZ": where an organisation's people handle a device. */
export async function organizationPlace(manager: EntityManager, organizationId: string, room?: string | null): Promise<string> {
  const rows: { name: string; city: string | null; region: string | null }[] = await manager.query(
    `SELECT name, city, region FROM organizations WHERE id = $1`,
    [organizationId],
  );
  const org = rows[0];
  if (!org) return room ?? 'Unknown place';
  const place = [org.name, org.city, org.region].filter(Boolean).join(', ');
  return room ? `${place} (${room})` : place;
}

interface CaseAccess {
  id: string;
  reference: string;
  status: string;
  sensitivity: string[];
  mediaType: string;
  partnerOrganizationId: string;
  labOrganizationId: string | null;
}

/** The case for the shop that opened it, the lab that holds it, or the network; anyone else is told it does not exist. */
export async function caseForViewer(manager: EntityManager, viewer: Pick<Actor, 'organizationId' | 'organizationKind'>, referralId: string): Promise<CaseAccess> {
  if (!UUID.test(referralId)) throw AppError.notFound('That case');
  const rows: {
    id: string;
    reference: string;
    status: string;
    sensitivity: string[];
    media_type: string;
    partner_organization_id: string;
    lab_organization_id: string | null;
  }[] = await manager.query(
    `SELECT id, reference, status, sensitivity, media_type, partner_organization_id, lab_organization_id FROM referrals WHERE id = $1`,
    [referralId],
  );
  const r = rows[0];
  const allowed =
    r && (viewer.organizationKind === 'network' || r.partner_organization_id === viewer.organizationId || r.lab_organization_id === viewer.organizationId);
  if (!allowed) throw AppError.notFound('That case');
  return {
    id: r.id,
    reference: r.reference,
    status: r.status,
    sensitivity: r.sensitivity,
    mediaType: r.media_type,
    partnerOrganizationId: r.partner_organization_id,
    labOrganizationId: r.lab_organization_id,
  };
}

/**
 * Recomputes every hash from the stored fields (verifyChain), compares the last one with the head
 * kept beside the log, and checks each stored previous-hash link; the earliest failure is reported.
 */
export async function verifyStoredChain(rows: readonly CustodyEntryRow[], head: CustodyHead | null): Promise<ChainVerification> {
  let result = await verifyChain(rows.map(toStored), head ? { expectedHeadHash: head.headHash } : {});
  if (result.intact && rows.length > 0 && !head) {
    result = { intact: false, firstBrokenSequence: rows.length, reason: 'the head hash kept beside the log is missing' };
  }
  for (const [i, row] of rows.entries()) {
    if (!result.intact && result.firstBrokenSequence <= row.sequence) break;
    const expected = i === 0 ? null : rows[i - 1]!.hash;
    if (row.previousHash !== expected) {
      return { intact: false, firstBrokenSequence: row.sequence, reason: `entry ${row.sequence} does not point to the hash of the entry before it` };
    }
  }
  return result;
}

async function loadLog(manager: EntityManager, referralId: string) {
  const rows = await manager.find(CustodyEntryRow, { where: { referralId }, order: { sequence: 'ASC' } });
  const head = await manager.findOneBy(CustodyHead, { referralId });
  return { rows, head, verification: await verifyStoredChain(rows, head) };
}

const isLegalEvidence = (c: CaseAccess) => c.sensitivity.includes('legal_evidence');

export async function readCustody(ctx: ServiceContext, viewer: Actor, referralId: string): Promise<CustodyLogDto> {
  const manager = ctx.db.manager;
  const found = await caseForViewer(manager, viewer, referralId);
  const { rows, verification } = await loadLog(manager, found.id);
  return {
    referral: { id: found.id, reference: found.reference, legalEvidence: isLegalEvidence(found) },
    entries: rows.map(toCustodyEntryDto),
    headHash: rows.at(-1)?.hash ?? null,
    verification,
    checkedAt: new Date().toISOString(),
    signedExportAvailable: isLegalEvidence(found) && rows.length > 0 && verification.intact,
  };
}

/** A step a lab records by hand (to the clean bench, imaged), by someone at the lab that holds the case. */
export async function recordLabCustody(ctx: ServiceContext, actor: Actor, referralId: string, rawInput: unknown): Promise<CustodyEntryDto> {
  const input = parseInput(appendCustodyInput, rawInput);
  return ctx.db.transaction(async (manager) => {
    const found = await caseForViewer(manager, actor, referralId);
    if (actor.organizationKind !== 'lab' || found.labOrganizationId !== actor.organizationId) throw AppError.notFound('That case');
    const [person]: { name: string }[] = await manager.query(`SELECT name FROM users WHERE id = $1`, [actor.userId]);
    return appendCustody(manager, found.id, {
      action: input.action,
      actor: { type: 'user', id: actor.userId, name: person?.name ?? 'Unknown user' },
      location: await organizationPlace(manager, actor.organizationId, input.location),
      details: input.note ? { note: input.note } : {},
    });
  });
}

export interface SignedCustodyExport {
  pdf: Buffer;
  statement: CustodyStatement;
  signature: string;
  keyId: string;
  fileName: string;
}

/** The signed PDF of a legal-evidence case's log; refused while the chain is broken. */
export async function exportCustodyPdf(ctx: ServiceContext, signer: CustodySigner, viewer: Actor, referralId: string): Promise<SignedCustodyExport> {
  const manager = ctx.db.manager;
  const found = await caseForViewer(manager, viewer, referralId);
  if (!isLegalEvidence(found)) {
    throw AppError.conflict('Only cases flagged as legal evidence export a signed custody log; the log is on the case page.');
  }
  const { rows, verification } = await loadLog(manager, found.id);
  if (rows.length === 0) throw AppError.conflict('The custody log has no entries yet, so there is nothing to sign.');
  if (!verification.intact) {
    throw AppError.conflict(
      `The custody log fails verification at entry ${verification.firstBrokenSequence} (${verification.reason}); no signed export is issued. Tell the network admin.`,
    );
  }
  const statement: CustodyStatement = {
    referralId: found.id,
    reference: found.reference,
    entryCount: rows.length,
    headHash: rows.at(-1)!.hash,
    exportedAt: new Date().toISOString(),
  };
  const signature = signer.sign(custodyStatementText(statement));
  const parties: { partner: string; lab: string | null; make: string | null; model: string | null; serial: string | null }[] = await manager.query(
    `SELECT p.name AS partner, l.name AS lab, r.device_make AS make, r.device_model AS model, r.device_serial AS serial
       FROM referrals r JOIN organizations p ON p.id = r.partner_organization_id LEFT JOIN organizations l ON l.id = r.lab_organization_id
      WHERE r.id = $1`,
    [found.id],
  );
  const info = parties[0]!;
  const [exporter]: { name: string }[] = await manager.query(`SELECT name FROM users WHERE id = $1`, [viewer.userId]);
  const pdfCase: CustodyPdfCase = {
    reference: found.reference,
    mediaType: found.mediaType,
    device: [info.make, info.model].filter(Boolean).join(' ') || null,
    serial: info.serial,
    shop: info.partner,
    lab: info.lab,
  };
  const pdf = await custodyLogPdf({
    case: pdfCase,
    entries: rows.map(toCustodyEntryDto),
    statement,
    statementText: custodyStatementText(statement),
    signature,
    keyId: signer.keyId,
    publicKeyPem: signer.publicKeyPem,
    developmentKey: signer.development,
    exportedBy: exporter?.name ?? 'Unknown user',
  });
  await ctx.db.transaction((tx) =>
    recordAudit(tx, {
      action: 'custody.exported',
      actorUserId: viewer.userId,
      organizationId: viewer.organizationId,
      targetType: 'referral',
      targetId: found.id,
      details: { reference: found.reference, entryCount: statement.entryCount, headHash: statement.headHash, keyId: signer.keyId },
    }),
  );
  return { pdf, statement, signature, keyId: signer.keyId, fileName: `custody-log-${found.reference}.pdf` };
}

/**
 * Checks a signature from an export against the server's public key, and whether the log still holds
 * the exported entries unchanged (entries added later do not count against it).
 */
export async function verifyCustodySignature(ctx: ServiceContext, signer: CustodySigner, viewer: Actor, rawInput: unknown): Promise<CustodySignatureCheckDto> {
  const input = parseInput(verifyCustodySignatureInput, rawInput);
  const { signature, ...statement } = input;
  const signatureValid = signer.verify(custodyStatementText(statement), signature);
  if (!signatureValid) return { signatureValid, matchesLog: null, keyId: signer.keyId };
  const found = await caseForViewer(ctx.db.manager, viewer, statement.referralId);
  const { rows, verification } = await loadLog(ctx.db.manager, found.id);
  const exportedHead = rows.find((r) => r.sequence === statement.entryCount);
  const intactThere = verification.intact || verification.firstBrokenSequence > statement.entryCount;
  return { signatureValid, matchesLog: !!exportedHead && exportedHead.hash === statement.headHash && intactThere && found.reference === statement.reference, keyId: signer.keyId };
}
