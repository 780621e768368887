import { Column, Entity, PrimaryGeneratedColumn } from 'typeorm';
import type { ValueTransformer } from 'typeorm';
import type { CategorySummary, FileState } from '@shared/domain/file-categories';
import type { LabSkill } from '@shared/vocabulary';
import type { EvaluationPart, PartCondition, QuoteLineKind, QuoteStatus, Recoverability } from '@shared/schemas/lab-work';

/** bigint columns arrive from pg as strings; every amount and byte count here is within 2^53. */
export const bigintNumber: ValueTransformer = {
  to: (value: number | null | undefined) => value,
  from: (value: string | null) => (value === null ? null : Number(value)),
};

export interface StoredFinding {
  part: EvaluationPart;
  condition: PartCondition;
  note: string | null;
}

/** The technician's evaluation of a received case; one per case, replaced while the case is evaluated. */
@Entity('lab_evaluations')
export class LabEvaluation {
  @PrimaryGeneratedColumn('uuid') id!: string;
  @Column({ type: 'uuid' }) referralId!: string;
  @Column({ type: 'jsonb' }) findings!: StoredFinding[];
  @Column({ type: 'text' }) recoverability!: Recoverability;
  @Column({ type: 'text' }) plan!: string;
  @Column({ type: 'uuid', nullable: true }) recordedByUserId!: string | null;
  @Column({ type: 'text' }) recordedByName!: string;
  @Column({ type: 'timestamptz' }) recordedAt!: Date;
}

export interface StoredQuoteLine {
  kind: QuoteLineKind;
  skill: LabSkill | null;
  description: string;
  amountMinor: number;
}

/** A quote the lab manager sent; a revised quote supersedes the open one. */
@Entity('lab_quotes')
export class LabQuote {
  @PrimaryGeneratedColumn('uuid') id!: string;
  @Column({ type: 'uuid' }) referralId!: string;
  @Column({ type: 'integer' }) version!: number;
  @Column({ type: 'text' }) status!: QuoteStatus;
  @Column({ type: 'text' }) currency!: string;
  @Column({ type: 'jsonb' }) lines!: StoredQuoteLine[];
  @Column({ type: 'bigint', transformer: bigintNumber }) totalMinor!: number;
  @Column({ type: 'bigint', transformer: bigintNumber }) serviceLinesMinor!: number;
  @Column({ type: 'text', nullable: true }) note!: string | null;
  @Column({ type: 'timestamptz' }) sentAt!: Date;
  @Column({ type: 'uuid', nullable: true }) sentByUserId!: string | null;
  @Column({ type: 'text' }) sentByName!: string;
  @Column({ type: 'timestamptz', nullable: true }) approvedAt!: Date | null;
  @Column({ type: 'text', nullable: true }) approvedName!: string | null;
  @Column({ type: 'text', nullable: true }) approvedIp!: string | null;
  @Column({ type: 'text', nullable: true }) approvedUserAgent!: string | null;
  @Column({ type: 'text', nullable: true }) termsVersion!: string | null;
  @Column({ type: 'timestamptz', nullable: true }) declinedAt!: Date | null;
  @Column({ type: 'text', nullable: true }) declineReason!: string | null;
}

export type ReporterType = 'user' | 'api_key';

/** One progress report of imaging the patient drive; the newest one is the state. */
@Entity('imaging_reports')
export class ImagingReport {
  @PrimaryGeneratedColumn('uuid') id!: string;
  @Column({ type: 'uuid' }) referralId!: string;
  @Column({ type: 'bigint', transformer: bigintNumber }) totalBytes!: number;
  @Column({ type: 'bigint', transformer: bigintNumber }) bytesRead!: number;
  @Column({ type: 'bigint', transformer: bigintNumber }) unreadableSectors!: number;
  @Column({ type: 'integer' }) sectorSizeBytes!: number;
  @Column({ type: 'double precision' }) rateBytesPerSec!: number;
  @Column({ type: 'text' }) reportedByType!: ReporterType;
  @Column({ type: 'text' }) reportedById!: string;
  @Column({ type: 'text' }) reportedByName!: string;
  @Column({ type: 'timestamptz', default: () => 'clock_timestamp()' }) reportedAt!: Date;
}

export type StoredReviewStatus = 'pending' | 'confirmed' | 'disputed' | 'superseded';

/** The lab's recovered-file list: the CSV in blob storage, its summary here. */
@Entity('recovered_file_manifests')
export class RecoveredFileManifest {
  @PrimaryGeneratedColumn('uuid') id!: string;
  @Column({ type: 'uuid' }) referralId!: string;
  @Column({ type: 'integer' }) version!: number;
  /** SHA-256 of the CSV, also its storage key. */
  @Column({ type: 'text' }) contentHash!: string;
  @Column({ type: 'integer' }) sizeBytes!: number;
  @Column({ type: 'integer' }) fileCount!: number;
  @Column({ type: 'bigint', transformer: bigintNumber }) totalBytes!: number;
  @Column({ type: 'jsonb' }) summary!: CategorySummary[];
  /** A few file names per category, so the customer recognises their files. */
  @Column({ type: 'jsonb' }) examples!: Record<string, { path: string; state: FileState }[]>;
  @Column({ type: 'text' }) uploadedByType!: ReporterType;
  @Column({ type: 'text' }) uploadedById!: string;
  @Column({ type: 'text' }) uploadedByName!: string;
  @Column({ type: 'timestamptz' }) uploadedAt!: Date;
  @Column({ type: 'text' }) reviewStatus!: StoredReviewStatus;
  @Column({ type: 'timestamptz', nullable: true }) reviewedAt!: Date | null;
  @Column({ type: 'text', nullable: true }) reviewNote!: string | null;
  @Column({ type: 'text', nullable: true }) reviewedIp!: string | null;
}

export type CheckoutStatus = 'open' | 'paid' | 'expired';

/** A hosted checkout session for the customer's approved quote; at most one per case is ever paid. */
@Entity('customer_checkouts')
export class CustomerCheckout {
  @PrimaryGeneratedColumn('uuid') id!: string;
  @Column({ type: 'uuid' }) referralId!: string;
  @Column({ type: 'uuid' }) quoteId!: string;
  @Column({ type: 'text' }) sessionId!: string;
  @Column({ type: 'text' }) paymentIntentId!: string;
  @Column({ type: 'text', nullable: true }) url!: string | null;
  @Column({ type: 'bigint', transformer: bigintNumber }) amountMinor!: number;
  @Column({ type: 'text' }) currency!: string;
  @Column({ type: 'text' }) status!: CheckoutStatus;
  @Column({ type: 'timestamptz' }) expiresAt!: Date;
  @Column({ type: 'bigint', nullable: true, transformer: bigintNumber }) feeMinor!: number | null;
  @Column({ type: 'timestamptz', nullable: true }) paidAt!: Date | null;
  @Column({ type: 'text', nullable: true }) lastFailure!: string | null;
  @Column({ type: 'text', nullable: true }) lastFailureChargeId!: string | null;
  @Column({ type: 'timestamptz', default: () => 'now()' }) createdAt!: Date;
  @Column({ type: 'timestamptz', default: () => 'now()' }) updatedAt!: Date;
}

/** Where the customer wants the recovered data sent. */
@Entity('customer_return_addresses')
export class CustomerReturnAddress {
  @Column({ type: 'uuid', primary: true }) referralId!: string;
  @Column({ type: 'text' }) name!: string;
  @Column({ type: 'text' }) line1!: string;
  @Column({ type: 'text', nullable: true }) line2!: string | null;
  @Column({ type: 'text' }) city!: string;
  @Column({ type: 'text' }) region!: string;
  @Column({ type: 'text' }) postalCode!: string;
  @Column({ type: 'text' }) country!: string;
  @Column({ type: 'text', nullable: true }) phone!: string | null;
  @Column({ type: 'timestamptz' }) updatedAt!: Date;
}
