import type { EntityManager } from 'typeorm';
import { categoryForPath, parseManifestCsv, summarizeManifest, type FileState, type ManifestRow } from '@shared/domain/file-categories';
import { confirmFilesInput, disputeFilesInput } from '@shared/schemas/customer';
import { MANIFEST_EXAMPLES_PER_CATEGORY, MANIFEST_MAX_BYTES, type ManifestDto } from '@shared/schemas/lab-work';
import type { FieldError } from '@shared/schemas/api-error';
import type { PriorityCategory } from '@shared/vocabulary';
import { recordAudit } from '../audit';
import { issueCustomerLink, systemIssuer } from '../customer-link';
import { AppError } from '../lib/errors';
import type { ServiceContext } from '../lib/context';
import { parseInput } from '../lib/validate';
import { enqueueEmail } from '../notifications';
import { Organization } from '../organizations';
import type { Referral, StoredPriority } from '../referrals/entities';
import { recordTimeline } from '../routing';
import type { BlobStorage } from '../uploads';
import { findLabCase, moveCase, requireStatus, resolveWorker, type LabPrincipal } from './access';
import type { CustomerMeta } from './quotes';
import { RecoveredFileManifest } from './entities';
import type { StepMeta } from './evaluation';

// The recovered-file list. The lab uploads a CSV (path,size,state); Platterpost keeps the file, groups
// it into the customer's priority categories by file type (IANA media types through mime-db) and shows,
// per category, how many files came back and in what state, so the customer can confirm that what
// mattered is there — or dispute — before the data ships back.

/** At most this many line problems are listed; the rest are counted. */
const MAX_LISTED_PROBLEMS = 50;

export interface ManifestUpload {
  originalName: string;
  bytes: Buffer;
}

export function toManifestDto(m: RecoveredFileManifest, priorities: readonly StoredPriority[]): ManifestDto {
  const order = new Map(priorities.map((p, i) => [p.category, i]));
  const categories = m.summary
    .filter((s) => order.has(s.category) || s.files > 0)
    .map((s) => ({
      category: s.category,
      priority: order.get(s.category) ?? null,
      note: priorities.find((p) => p.category === s.category)?.note ?? null,
      files: s.files,
      bytes: s.bytes,
      intact: s.intact,
      partial: s.partial,
      unreadable: s.unreadable,
      examples: m.examples[s.category] ?? [],
    }))
    // The customer's priorities first, in their order; then the rest by how many files they hold.
    .sort((a, b) => (a.priority ?? Infinity) - (b.priority ?? Infinity) || b.files - a.files);
  return {
    id: m.id,
    version: m.version,
    uploadedAt: m.uploadedAt.toISOString(),
    uploadedBy: m.uploadedByName,
    fileCount: m.fileCount,
    totalBytes: m.totalBytes,
    categories,
    review: { status: m.reviewStatus === 'superseded' ? 'pending' : m.reviewStatus, at: m.reviewedAt?.toISOString() ?? null, note: m.reviewNote },
  };
}

export async function currentManifest(manager: EntityManager, referralId: string): Promise<RecoveredFileManifest | null> {
  return manager.findOne(RecoveredFileManifest, { where: { referralId }, order: { version: 'DESC' } });
}

/** The CSV as text: UTF-8 (a byte-order mark is allowed), anything else is refused rather than guessed. */
function decodeManifest(upload: ManifestUpload | null): string {
  if (!upload || upload.bytes.length === 0) {
    throw AppError.validation([{ path: 'manifest', message: 'Attach the recovered-file list as a CSV file (multipart/form-data, field “manifest”)' }]);
  }
  if (upload.bytes.length > MANIFEST_MAX_BYTES) {
    throw AppError.validation([{ path: 'manifest', message: `The file list is larger than ${MANIFEST_MAX_BYTES / 1024 / 1024} MB` }]);
  }
  try {
    return new TextDecoder('utf-8', { fatal: true }).decode(upload.bytes);
  } catch {
    throw AppError.validation([{ path: 'manifest', message: 'The file list is not UTF-8 text; export the CSV as UTF-8' }]);
  }
}

function parseRows(text: string): ManifestRow[] {
  const parsed = parseManifestCsv(text);
  if (!parsed.ok) {
    const fields: FieldError[] = parsed.errors.slice(0, MAX_LISTED_PROBLEMS).map((e) => ({
      path: `manifest.line${e.line}${e.field ? `.${e.field}` : ''}`,
      message: `Line ${e.line}: ${e.message}`,
    }));
    if (parsed.errors.length > MAX_LISTED_PROBLEMS) {
      fields.push({ path: 'manifest', message: `…and ${parsed.errors.length - MAX_LISTED_PROBLEMS} more problems` });
    }
    throw AppError.validation(fields, `The file list has ${parsed.errors.length === 1 ? 'a problem' : `${parsed.errors.length} problems`}; nothing was saved`);
  }
  if (parsed.rows.length === 0) throw AppError.validation([{ path: 'manifest', message: 'The file list has a header but no files' }]);
  return parsed.rows;
}

/** A few files per category for the customer to recognise; intact ones first. */
function examplesOf(rows: readonly ManifestRow[]): Record<string, { path: string; state: FileState }[]> {
  const rank: Record<FileState, number> = { intact: 0, partial: 1, unreadable: 2 };
  const byCategory = new Map<PriorityCategory, { path: string; state: FileState }[]>();
  for (const row of rows) {
    const category = categoryForPath(row.path).category;
    const list = byCategory.get(category) ?? [];
    list.push({ path: row.path, state: row.state });
    byCategory.set(category, list);
  }
  return Object.fromEntries(
    [...byCategory].map(([category, list]) => [
      category,
      list
        .map((item, index) => ({ item, index }))
        .sort((a, b) => rank[a.item.state] - rank[b.item.state] || a.index - b.index)
        .slice(0, MANIFEST_EXAMPLES_PER_CATEGORY)
        .map(({ item }) => item),
    ]),
  );
}

export async function uploadManifest(
  ctx: ServiceContext,
  storage: BlobStorage,
  who: LabPrincipal,
  id: string,
  upload: ManifestUpload | null,
  meta: StepMeta = {},
): Promise<string> {
  const rows = parseRows(decodeManifest(upload));
  return ctx.db.transaction((manager) => uploadManifestIn(ctx, manager, storage, who, id, upload!.bytes, rows, meta));
}

/** The upload in the caller's transaction, for rows already parsed from these bytes. */
export async function uploadManifestIn(
  ctx: ServiceContext,
  manager: EntityManager,
  storage: BlobStorage,
  who: LabPrincipal,
  id: string,
  bytes: Buffer,
  rows: readonly ManifestRow[],
  meta: StepMeta = {},
): Promise<string> {
  const summary = summarizeManifest(rows);
  const examples = examplesOf(rows);
  const fileCount = rows.length;
  const totalBytes = rows.reduce((sum, r) => sum + r.sizeBytes, 0);
  const intact = summary.reduce((sum, s) => sum + s.intact, 0);
  const partial = summary.reduce((sum, s) => sum + s.partial, 0);
  const unreadable = summary.reduce((sum, s) => sum + s.unreadable, 0);

  const worker = await resolveWorker(manager, who);
  const referral = await findLabCase(manager, worker.organizationId, id, { lock: true });
  requireStatus(referral, ['recovering', 'ready_for_review'], 'Uploading the recovered-file list');
  const previous = await currentManifest(manager, referral.id);
  if (previous?.reviewStatus === 'confirmed') {
    throw AppError.conflict('The customer has already confirmed the recovered files; the list can no longer be replaced.');
  }
  // The bytes first: should the transaction fail, a stored blob without a row is harmless (content-addressed).
  const { key } = await storage.put(bytes);
  if (previous) await manager.update(RecoveredFileManifest, previous.id, { reviewStatus: 'superseded' });
  const now = meta.now ?? new Date();
  const manifest = await manager.save(
    manager.create(RecoveredFileManifest, {
      referralId: referral.id,
      version: (previous?.version ?? 0) + 1,
      contentHash: key,
      sizeBytes: bytes.length,
      fileCount,
      totalBytes,
      summary,
      examples,
      uploadedByType: worker.actor.type,
      uploadedById: worker.actor.id,
      uploadedByName: worker.actor.name,
      uploadedAt: now,
      reviewStatus: 'pending',
      reviewedAt: null,
      reviewNote: null,
      reviewedIp: null,
    }),
  );
  const counts = `${fileCount.toLocaleString('en-US')} ${fileCount === 1 ? 'file' : 'files'} (${intact.toLocaleString('en-US')} intact, ${partial.toLocaleString('en-US')} partly readable, ${unreadable.toLocaleString('en-US')} unreadable)`;
  const entry = {
    kind: 'files_ready',
    summary: `${worker.actor.name} ${previous ? `replaced the recovered-file list (version ${manifest.version})` : 'uploaded the recovered-file list'}: ${counts}.`,
    actor: worker.actor,
    details: { manifestId: manifest.id, version: manifest.version, fileCount, totalBytes, intact, partial, unreadable },
    at: now,
  };
  if (referral.status === 'recovering') await moveCase(manager, referral, 'ready_for_review', entry);
  else await recordTimeline(manager, referral.id, entry);

  const lab = await manager.findOneBy(Organization, { id: worker.organizationId });
  const link = await issueCustomerLink(manager, { referralId: referral.id, reason: 'files_ready', issuer: systemIssuer, appUrl: ctx.config.appUrl, now });
  await enqueueEmail(manager, referral.customerEmail, 'customer_files_ready', {
    customerName: referral.customerName,
    reference: referral.reference,
    labName: lab?.name ?? 'The lab',
    fileCount: `${fileCount.toLocaleString('en-US')} ${fileCount === 1 ? 'file' : 'files'}`,
    url: link.url,
  });
  await recordAudit(manager, {
    action: 'lab_work.manifest_uploaded',
    actorUserId: worker.userId,
    organizationId: worker.organizationId,
    targetType: 'referral',
    targetId: referral.id,
    details: { manifestId: manifest.id, version: manifest.version, fileCount, contentHash: key, via: worker.actor.type },
    ip: meta.ip ?? null,
  });
  return referral.id;
}

async function reviewableManifest(manager: EntityManager, referral: Referral, manifestId: string): Promise<RecoveredFileManifest> {
  requireStatus(referral, ['ready_for_review'], 'Reviewing the recovered files');
  const manifest = await currentManifest(manager, referral.id);
  if (!manifest) throw AppError.conflict('The lab has not listed the recovered files yet.');
  if (manifest.id !== manifestId) {
    throw AppError.conflict('The lab has updated the file list since this page was loaded. Reload the page to see it.', [
      { path: 'manifestId', message: 'Not the current file list' },
    ]);
  }
  if (manifest.reviewStatus === 'confirmed') throw AppError.conflict('You have already confirmed these files.');
  return manifest;
}

/** The customer confirms that what mattered is there; the data may then ship back. */
export async function confirmFiles(manager: EntityManager, referral: Referral, rawInput: unknown, meta: CustomerMeta): Promise<void> {
  const input = parseInput(confirmFilesInput, rawInput);
  const manifest = await reviewableManifest(manager, referral, input.manifestId);
  const now = meta.now ?? new Date();
  await manager.update(RecoveredFileManifest, manifest.id, { reviewStatus: 'confirmed', reviewedAt: now, reviewedIp: meta.ip });
  await manager.query(`UPDATE referrals SET updated_at = now() WHERE id = $1`, [referral.id]);
  await recordTimeline(manager, referral.id, {
    kind: 'files_confirmed',
    summary: `The customer confirmed the recovered files (${manifest.fileCount.toLocaleString('en-US')} files); the data can ship back.`,
    actor: { type: 'customer', id: meta.linkId, name: referral.customerName },
    details: { manifestId: manifest.id, version: manifest.version },
    at: now,
  });
  await recordAudit(manager, {
    action: 'customer.files_confirmed',
    organizationId: referral.partnerOrganizationId,
    targetType: 'referral',
    targetId: referral.id,
    details: { manifestId: manifest.id, linkId: meta.linkId },
    ip: meta.ip,
  });
}

/** The customer says something that mattered is missing or damaged; the lab answers with a new list. */
export async function disputeFiles(manager: EntityManager, referral: Referral, rawInput: unknown, meta: CustomerMeta): Promise<void> {
  const input = parseInput(disputeFilesInput, rawInput);
  const manifest = await reviewableManifest(manager, referral, input.manifestId);
  const now = meta.now ?? new Date();
  await manager.update(RecoveredFileManifest, manifest.id, { reviewStatus: 'disputed', reviewedAt: now, reviewNote: input.note, reviewedIp: meta.ip });
  await manager.query(`UPDATE referrals SET updated_at = now() WHERE id = $1`, [referral.id]);
  await recordTimeline(manager, referral.id, {
    kind: 'files_disputed',
    summary: `The customer disputed the recovered files: “${input.note}”`,
    actor: { type: 'customer', id: meta.linkId, name: referral.customerName },
    details: { manifestId: manifest.id, version: manifest.version },
    at: now,
  });
  await recordAudit(manager, {
    action: 'customer.files_disputed',
    organizationId: referral.partnerOrganizationId,
    targetType: 'referral',
    targetId: referral.id,
    details: { manifestId: manifest.id, linkId: meta.linkId },
    ip: meta.ip,
  });
}
