import type { EntityManager } from 'typeorm';
import type { z } from 'zod';
import { formatBytes, imagingProgress } from '@shared/domain/imaging';
import { imagingReportInput, type ImagingDto } from '@shared/schemas/lab-work';
import { recordAudit } from '../audit';
import { AppError } from '../lib/errors';
import type { ServiceContext } from '../lib/context';
import { parseInput } from '../lib/validate';
import { recordTimeline } from '../routing';
import { appendCustody, organizationPlace } from '../custody';
import { findLabCase, moveCase, requireStatus, resolveWorker, touchCase, type LabPrincipal } from './access';
import { ImagingReport } from './entities';
import type { StepMeta } from './evaluation';

// Imaging progress: the technician or the lab's imaging tool reports bytes passed over, unreadable
// sectors and the current rate; Platterpost works out the share done and the time left
// (shared/domain/imaging.ts). The first report of a paid case starts recovery; the timeline gets the
// start and the finish, not every report.

/** SI, as drive makers count: 1 GB = 10^9 bytes. */
const BYTES_PER_GB = 1e9;

export function toImagingDto(r: ImagingReport): ImagingDto {
  const progress = imagingProgress({
    totalBytes: r.totalBytes,
    bytesRead: r.bytesRead,
    rateBytesPerSec: r.rateBytesPerSec,
    unreadableSectors: r.unreadableSectors,
    sectorSizeBytes: r.sectorSizeBytes,
  });
  const eta = progress.etaFrom(r.reportedAt);
  return {
    totalBytes: r.totalBytes,
    bytesRead: r.bytesRead,
    copiedBytes: progress.copiedBytes,
    unreadableSectors: progress.unreadableSectors,
    unreadableBytes: progress.unreadableBytes,
    rateBytesPerSec: r.rateBytesPerSec,
    percent: progress.percent,
    remainingSeconds: progress.remainingSeconds,
    eta: eta?.toISOString() ?? null,
    reportedAt: r.reportedAt.toISOString(),
    finished: progress.remainingBytes === 0,
    reportedBy: r.reportedByName,
  };
}

export async function latestImaging(manager: EntityManager, referralId: string): Promise<ImagingReport | null> {
  return manager.findOne(ImagingReport, { where: { referralId }, order: { reportedAt: 'DESC', id: 'DESC' } });
}

export async function reportImaging(ctx: ServiceContext, who: LabPrincipal, id: string, rawInput: unknown, meta: StepMeta = {}): Promise<string> {
  const input = parseInput(imagingReportInput, rawInput);
  return ctx.db.transaction((manager) => reportImagingIn(manager, who, id, input, meta));
}

export async function reportImagingIn(manager: EntityManager, who: LabPrincipal, id: string, input: z.output<typeof imagingReportInput>, meta: StepMeta = {}): Promise<string> {
  const worker = await resolveWorker(manager, who);
  const referral = await findLabCase(manager, worker.organizationId, id, { lock: true });
  if (referral.status === 'approved') {
    throw AppError.conflict('Imaging starts once the customer has paid; the case is still waiting for the payment.');
  }
  requireStatus(referral, ['paid', 'recovering'], 'Reporting imaging progress');
  const previous = await latestImaging(manager, referral.id);
  const totalBytes =
    input.totalBytes ?? previous?.totalBytes ?? (referral.capacityGb ? Math.round(referral.capacityGb * BYTES_PER_GB) : undefined);
  if (totalBytes === undefined) {
    throw AppError.validation([{ path: 'totalBytes', message: 'The case has no capacity on record; give the drive’s size in bytes' }]);
  }
  if (input.bytesRead > totalBytes) {
    throw AppError.validation([{ path: 'bytesRead', message: `Bytes read cannot exceed the drive’s ${totalBytes.toLocaleString('en-US')} bytes` }]);
  }
  const now = meta.now ?? new Date();
  const report = await manager.save(
    manager.create(ImagingReport, {
      referralId: referral.id,
      totalBytes,
      bytesRead: input.bytesRead,
      unreadableSectors: input.unreadableSectors,
      sectorSizeBytes: input.sectorSizeBytes,
      rateBytesPerSec: input.rateBytesPerSec,
      reportedByType: worker.actor.type,
      reportedById: worker.actor.id,
      reportedByName: worker.actor.name,
      reportedAt: now,
    }),
  );
  const dto = toImagingDto(report);

  if (referral.status === 'paid') {
    await moveCase(manager, referral, 'recovering', {
      kind: 'imaging_started',
      summary: `${worker.actor.name} started imaging the ${formatBytes(totalBytes)} drive.`,
      actor: worker.actor,
      details: { totalBytes },
      at: now,
    });
    await recordAudit(manager, {
      action: 'lab_work.imaging_started',
      actorUserId: worker.userId,
      organizationId: worker.organizationId,
      targetType: 'referral',
      targetId: referral.id,
      details: { via: worker.actor.type, totalBytes },
      ip: meta.ip ?? null,
    });
  } else {
    await touchCase(manager, referral.id);
  }
  const wasFinished = previous ? previous.bytesRead >= previous.totalBytes : false;
  if (dto.finished && !wasFinished) {
    await recordTimeline(manager, referral.id, {
      kind: 'imaging_finished',
      summary: `Imaging finished: ${formatBytes(dto.copiedBytes)} copied${dto.unreadableSectors ? `, ${dto.unreadableSectors.toLocaleString('en-US')} sectors unreadable` : ', every sector read'}.`,
      actor: worker.actor,
      details: { copiedBytes: dto.copiedBytes, unreadableSectors: dto.unreadableSectors },
      at: now,
    });
    await appendCustody(manager, referral.id, { action: 'imaged', actor: worker.actor, location: await organizationPlace(manager, worker.organizationId), at: now, details: { copiedBytes: dto.copiedBytes, unreadableSectors: dto.unreadableSectors } });
  }
  return referral.id;
}
