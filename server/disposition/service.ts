import type { Readable } from 'node:stream';
import type { EntityManager } from 'typeorm';
import { achievedLevel, checkSanitization, sanitizationLevelLabels, sanitizationTechniqueLabels } from '@shared/domain/sanitization';
import {
  dispositionItemLabels,
  disposableStatuses,
  failedPartStatuses,
  recordDispositionInput,
  type CaseDispositionDto,
  type CertificateDto,
  type DispositionDto,
  type RecordDisposition,
} from '@shared/schemas/disposition';
import { caseStatusLabels, roleLabels, type CaseStatus, type Role } from '@shared/vocabulary';
import { recordAudit } from '../audit';
import { appendCustody, caseForViewer, organizationPlace } from '../custody';
import { AppError } from '../lib/errors';
import type { Actor, ServiceContext } from '../lib/context';
import { parseInput } from '../lib/validate';
import { addTimelineEntry, lockReferral, Referral } from '../referrals';
import type { BlobStorage } from '../uploads';
import { certificatePdf } from './certificate';
import { MediaDisposition, SanitizationCertificate } from './entities';

// When the work on a case is over, the original media and any failed parts are returned or
// sanitized. A sanitization is checked against our NIST SP 800-88 Rev. 1 Appendix A rules, written
// to the custody log and issued a certificate of sanitization; recording the original media closes the case.

export function certificateUrl(referralId: string, certificateId: string): string {
  return `/api/referrals/${referralId}/certificates/${certificateId}.pdf`;
}

function toCertificateDto(c: SanitizationCertificate): CertificateDto {
  return { id: c.id, number: c.number, issuedAt: c.issuedAt.toISOString(), sha256: c.contentHash, sizeBytes: c.sizeBytes, url: certificateUrl(c.referralId, c.id) };
}

function toDispositionDto(d: MediaDisposition, labName: string, custodySequence: number, certificate: SanitizationCertificate | undefined): DispositionDto {
  return {
    id: d.id,
    item: d.item,
    description: d.description,
    serialNumber: d.serialNumber,
    mediaType: d.mediaType,
    outcome: d.outcome,
    note: d.note,
    returned: d.outcome === 'returned' ? { to: d.returnedTo!, trackingCode: d.trackingCode } : null,
    sanitization:
      d.outcome === 'sanitized'
        ? {
            level: d.level!,
            technique: d.technique!,
            techniqueDetails: d.techniqueDetails,
            selfEncrypting: d.selfEncrypting,
            driveCommand: d.driveCommand,
            tool: { name: d.toolName!, version: d.toolVersion, serialNumber: d.toolSerialNumber },
            verification: { method: d.verificationMethod!, note: d.verificationNote },
            destination: d.destination,
            basis: d.basis!,
          }
        : null,
    performedAt: d.performedAt.toISOString(),
    performedBy: { id: d.performedByUserId, name: d.performedByName },
    lab: { id: d.labOrganizationId, name: labName },
    custodySequence,
    certificate: certificate ? toCertificateDto(certificate) : null,
  };
}

async function caseDisposition(manager: EntityManager, referral: { id: string; reference: string; status: string; mediaType: string }): Promise<CaseDispositionDto> {
  const rows = await manager.find(MediaDisposition, { where: { referralId: referral.id }, order: { performedAt: 'ASC', createdAt: 'ASC' } });
  const certificates = await manager.find(SanitizationCertificate, { where: { referralId: referral.id }, order: { issuedAt: 'ASC' } });
  const byDisposition = new Map(certificates.map((c) => [c.dispositionId, c]));
  const extra: { id: string; lab_name: string; sequence: number }[] = rows.length
    ? await manager.query(
        `SELECT d.id, o.name AS lab_name, c.sequence FROM media_dispositions d
           JOIN organizations o ON o.id = d.lab_organization_id JOIN custody_entries c ON c.id = d.custody_entry_id
          WHERE d.referral_id = $1`,
        [referral.id],
      )
    : [];
  const info = new Map(extra.map((e) => [e.id, e]));
  const originalDisposed = rows.some((r) => r.item === 'original_media');
  return {
    referral: { id: referral.id, reference: referral.reference, status: referral.status as CaseStatus, mediaType: referral.mediaType as CaseDispositionDto['referral']['mediaType'] },
    acceptsOriginal: !originalDisposed && (disposableStatuses as readonly string[]).includes(referral.status),
    acceptsFailedParts: (failedPartStatuses as readonly string[]).includes(referral.status),
    originalDisposed,
    dispositions: rows.map((d) => toDispositionDto(d, info.get(d.id)?.lab_name ?? '', info.get(d.id)?.sequence ?? 0, byDisposition.get(d.id))),
    certificates: certificates.map((c) => ({ ...toCertificateDto(c), dispositionId: c.dispositionId })),
  };
}

export async function readDisposition(ctx: ServiceContext, viewer: Actor, referralId: string): Promise<CaseDispositionDto> {
  const found = await caseForViewer(ctx.db.manager, viewer, referralId);
  return caseDisposition(ctx.db.manager, found);
}

/**
 * What the verification may be (NIST SP 800-88 Rev. 1 §4.7, from memory): reading the media back, in
 * full or by a representative sample, shows a clear or purge worked; what is left after destruction is
 * inspected instead. A read-back of shredded media, or a look at a drive that was overwritten, shows nothing.
 */
function verificationProblem(input: Extract<RecordDisposition, { outcome: 'sanitized' }>, level: string): string | null {
  const method = input.verification.method;
  if (level === 'destroy' && method !== 'visual_inspection') {
    return 'Destroyed media cannot be read back: verify by inspecting what is left (particle size, no whole chips or platter pieces).';
  }
  if (level !== 'destroy' && method === 'visual_inspection') {
    return 'Looking at the device does not show that a clear or purge worked: read the media back, in full or by sampling, or attach the tool’s verification report.';
  }
  return null;
}

/** Refusals that name the field: a technique that does not sanitize the media, a level it does not reach. */
function sanitizationRefusal(input: Extract<RecordDisposition, { outcome: 'sanitized' }>, mediaType: Referral['mediaType']) {
  const check = checkSanitization({ mediaType, level: input.level, technique: input.technique, selfEncrypting: input.selfEncrypting, driveCommand: input.driveCommand });
  if (!check.ok) {
    const reached = achievedLevel(mediaType, input.technique, input);
    throw AppError.validation(
      [{ path: reached === null ? 'technique' : 'level', message: check.reason }],
      reached === null ? 'That technique does not sanitize this media' : 'That technique does not reach the level asked for',
    );
  }
  const problem = verificationProblem(input, check.achieves);
  if (problem) throw AppError.validation([{ path: 'verification.method', message: problem }]);
  return check;
}

export interface RecordedDisposition {
  disposition: CaseDispositionDto;
  dispositionId: string;
}

/** Records one item's disposition at the lab holding the case, in one transaction with its custody entry, certificate and timeline. */
export async function recordDisposition(ctx: ServiceContext, storage: BlobStorage, actor: Actor, referralId: string, rawInput: unknown): Promise<RecordedDisposition> {
  const input = parseInput(recordDispositionInput, rawInput);
  return ctx.db.transaction(async (manager) => {
    const visible = await caseForViewer(manager, actor, referralId);
    const referral = await lockReferral(manager, visible.id);
    if (!referral || actor.organizationKind !== 'lab' || referral.labOrganizationId !== actor.organizationId) throw AppError.notFound('That case');
    const allowed: readonly string[] = input.item === 'original_media' ? disposableStatuses : failedPartStatuses;
    if (!allowed.includes(referral.status)) {
      throw AppError.conflict(
        referral.status === 'closed'
          ? 'The case is closed: its original media has been returned or sanitized already.'
          : `The media is returned or sanitized once the work on the case is over (shipped back, no recovery possible, or quote declined); the case is ${caseStatusLabels[referral.status].toLowerCase()}.`,
      );
    }
    if (input.item === 'original_media' && (await manager.existsBy(MediaDisposition, { referralId: referral.id, item: 'original_media' }))) {
      throw AppError.conflict('The original media of this case has already been returned or sanitized.', [
        { path: 'item', message: 'Already recorded; record a failed part instead' },
      ]);
    }
    const mediaType = input.mediaType ?? referral.mediaType;
    const check = input.outcome === 'sanitized' ? sanitizationRefusal(input, mediaType) : null;

    const now = new Date();
    const [person]: { name: string; role: Role }[] = await manager.query(`SELECT name, role FROM users WHERE id = $1`, [actor.userId]);
    const who = { type: 'user' as const, id: actor.userId, name: person?.name ?? 'Unknown user' };
    const place = await organizationPlace(manager, actor.organizationId);
    const itemWords = `${dispositionItemLabels[input.item].toLowerCase()} (${input.description}${input.serialNumber ? `, serial ${input.serialNumber}` : ''})`;

    const custody = await appendCustody(manager, referral.id, {
      action: input.outcome === 'sanitized' ? 'sanitized' : 'returned',
      actor: who,
      location: place,
      at: now,
      details:
        input.outcome === 'sanitized'
          ? {
              item: input.item,
              description: input.description,
              serialNumber: input.serialNumber ?? null,
              mediaType,
              level: check!.achieves,
              technique: input.technique,
              tool: input.tool.name,
              verification: input.verification.method,
            }
          : { item: input.item, description: input.description, serialNumber: input.serialNumber ?? null, returnedTo: input.returnedTo, trackingCode: input.trackingCode ?? null },
    });

    const saved = await manager.save(
      manager.create(MediaDisposition, {
        referralId: referral.id,
        labOrganizationId: actor.organizationId,
        item: input.item,
        description: input.description,
        serialNumber: input.serialNumber ?? null,
        mediaType,
        outcome: input.outcome,
        note: input.note ?? null,
        ...(input.outcome === 'returned'
          ? { returnedTo: input.returnedTo, trackingCode: input.trackingCode ?? null }
          : {
              level: check!.achieves,
              technique: input.technique,
              techniqueDetails: input.techniqueDetails ?? null,
              selfEncrypting: input.selfEncrypting,
              driveCommand: input.driveCommand,
              toolName: input.tool.name,
              toolVersion: input.tool.version ?? null,
              toolSerialNumber: input.tool.serialNumber ?? null,
              verificationMethod: input.verification.method,
              verificationNote: input.verification.note ?? null,
              destination: input.destination ?? null,
              basis: check!.reason,
            }),
        performedAt: now,
        performedByUserId: actor.userId,
        performedByName: who.name,
        custodyEntryId: custody.id,
      }),
    );

    if (input.outcome === 'sanitized') {
      const [{ count }]: { count: string }[] = await manager.query(`SELECT count(*) FROM sanitization_certificates WHERE referral_id = $1`, [referral.id]);
      const number = `SC-${referral.reference}-${Number(count) + 1}`;
      const [lab]: { name: string; phone: string | null; email: string | null }[] = await manager.query(`SELECT name, phone, email FROM organizations WHERE id = $1`, [
        actor.organizationId,
      ]);
      const [shop]: { name: string }[] = await manager.query(`SELECT name FROM organizations WHERE id = $1`, [referral.partnerOrganizationId]);
      const pdf = await certificatePdf({
        number,
        issuedAt: now,
        disposition: saved,
        caseReference: referral.reference,
        shopName: shop?.name ?? '',
        lab: { name: lab?.name ?? '', place, phone: lab?.phone ?? null, email: lab?.email ?? null },
        technician: { name: who.name, roleLabel: person ? roleLabels[person.role] : '' },
        custody: { sequence: custody.sequence, hash: custody.hash },
      });
      // The bytes first, as photos do: should the transaction then fail, a stored blob without a row is harmless.
      const { key } = await storage.put(pdf);
      await manager.insert(SanitizationCertificate, {
        referralId: referral.id,
        dispositionId: saved.id,
        number,
        contentHash: key,
        sizeBytes: pdf.length,
        issuedAt: now,
        custodyHeadHash: custody.hash,
      });
      await recordAudit(manager, {
        action: 'disposition.sanitized',
        actorUserId: actor.userId,
        organizationId: actor.organizationId,
        targetType: 'referral',
        targetId: referral.id,
        details: { reference: referral.reference, certificate: number, item: input.item, level: check!.achieves, technique: input.technique },
      });
    }

    await addTimelineEntry(manager, referral.id, {
      kind: input.outcome === 'sanitized' ? 'media_sanitized' : 'media_returned',
      summary:
        input.outcome === 'sanitized'
          ? `${who.name} sanitized the ${itemWords}: ${sanitizationLevelLabels[check!.achieves].toLowerCase()} by ${sanitizationTechniqueLabels[input.technique].toLowerCase()}; certificate issued.`
          : `${who.name} recorded the ${itemWords} as returned to the ${input.returnedTo}${input.trackingCode ? ` (tracking ${input.trackingCode})` : ''}.`,
      actor: who,
      at: now,
      details: { dispositionId: saved.id, custodySequence: custody.sequence },
    });

    if (input.item === 'original_media') {
      const from = referral.status;
      await manager.update(Referral, referral.id, { status: 'closed' });
      referral.status = 'closed';
      await addTimelineEntry(manager, referral.id, {
        kind: 'closed',
        summary: `Case closed: the original media was ${input.outcome === 'sanitized' ? 'sanitized' : 'returned'}.`,
        actor: who,
        at: now,
        details: { from, to: 'closed', dispositionId: saved.id },
      });
    }
    return { disposition: await caseDisposition(manager, referral), dispositionId: saved.id };
  });
}

/** A certificate's PDF for whoever may see its case. */
export async function openCertificate(
  ctx: ServiceContext,
  storage: BlobStorage,
  viewer: Actor,
  referralId: string,
  certificateId: string,
): Promise<{ certificate: SanitizationCertificate; stream: Readable }> {
  const found = await caseForViewer(ctx.db.manager, viewer, referralId);
  if (!/^[0-9a-f-]{36}$/i.test(certificateId)) throw AppError.notFound('That certificate');
  const certificate = await ctx.db.getRepository(SanitizationCertificate).findOneBy({ id: certificateId, referralId: found.id });
  if (!certificate) throw AppError.notFound('That certificate');
  const stream = await storage.get(certificate.contentHash);
  if (!stream) throw AppError.notFound('That certificate');
  return { certificate, stream };
}
