import { Column, Entity, PrimaryGeneratedColumn } from 'typeorm';
import type { SanitizationLevel, SanitizationTechnique } from '@shared/domain/sanitization';
import type { DispositionItem, DispositionOutcome, ReturnRecipient, VerificationMethod } from '@shared/schemas/disposition';
import type { MediaType } from '@shared/vocabulary';

/** What became of the original media or a failed part of a case: returned, or sanitized (NIST SP 800-88 Rev. 1). */
@Entity('media_dispositions')
export class MediaDisposition {
  @PrimaryGeneratedColumn('uuid') id!: string;
  @Column({ type: 'uuid' }) referralId!: string;
  @Column({ type: 'uuid' }) labOrganizationId!: string;
  @Column({ type: 'text' }) item!: DispositionItem;
  @Column({ type: 'text' }) description!: string;
  @Column({ type: 'text', nullable: true }) serialNumber!: string | null;
  @Column({ type: 'text' }) mediaType!: MediaType;
  @Column({ type: 'text' }) outcome!: DispositionOutcome;
  @Column({ type: 'text', nullable: true }) note!: string | null;
  @Column({ type: 'text', nullable: true }) returnedTo!: ReturnRecipient | null;
  @Column({ type: 'text', nullable: true }) trackingCode!: string | null;
  /** The level the technique reached on this media (it may exceed the one asked for). */
  @Column({ type: 'text', nullable: true }) level!: SanitizationLevel | null;
  @Column({ type: 'text', nullable: true }) technique!: SanitizationTechnique | null;
  @Column({ type: 'text', nullable: true }) techniqueDetails!: string | null;
  @Column({ type: 'boolean', default: false }) selfEncrypting!: boolean;
  @Column({ type: 'boolean', default: false }) driveCommand!: boolean;
  @Column({ type: 'text', nullable: true }) toolName!: string | null;
  @Column({ type: 'text', nullable: true }) toolVersion!: string | null;
  @Column({ type: 'text', nullable: true }) toolSerialNumber!: string | null;
  @Column({ type: 'text', nullable: true }) verificationMethod!: VerificationMethod | null;
  @Column({ type: 'text', nullable: true }) verificationNote!: string | null;
  @Column({ type: 'text', nullable: true }) destination!: string | null;
  /** Why the technique reaches that level on this media, as our Appendix A rules state it. */
  @Column({ type: 'text', nullable: true }) basis!: string | null;
  @Column({ type: 'timestamptz' }) performedAt!: Date;
  @Column({ type: 'uuid' }) performedByUserId!: string;
  @Column({ type: 'text' }) performedByName!: string;
  @Column({ type: 'uuid' }) custodyEntryId!: string;
  @Column({ type: 'timestamptz', default: () => 'clock_timestamp()', insert: false, update: false }) createdAt!: Date;
}

/** A certificate of sanitization: the PDF in blob storage under its SHA-256, attached to the case. */
@Entity('sanitization_certificates')
export class SanitizationCertificate {
  @PrimaryGeneratedColumn('uuid') id!: string;
  @Column({ type: 'uuid' }) referralId!: string;
  @Column({ type: 'uuid' }) dispositionId!: string;
  @Column({ type: 'text' }) number!: string;
  @Column({ type: 'text' }) contentHash!: string;
  @Column({ type: 'integer' }) sizeBytes!: number;
  @Column({ type: 'timestamptz' }) issuedAt!: Date;
  /** The custody log's head right after the sanitization entry: ties the certificate to the chain. */
  @Column({ type: 'text' }) custodyHeadHash!: string;
}
