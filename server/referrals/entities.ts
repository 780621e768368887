import { Column, CreateDateColumn, Entity, JoinColumn, ManyToOne, PrimaryGeneratedColumn, UpdateDateColumn } from 'typeorm';
import type { BatteryCondition, CaseStatus, MediaType, PriorityCategory, SensitivityFlag, Symptom } from '@shared/vocabulary';
import type { TriageResult } from '@shared/domain/triage';
import type { BatteryAssessment } from '@shared/domain/battery';
import { Organization } from '../organizations/entities';

export interface StoredPriority {
  category: PriorityCategory;
  note: string | null;
}

export interface StoredBattery {
  installed: boolean;
  condition: BatteryCondition | null;
  wattHours: number | null;
  volts: number | null;
  milliampHours: number | null;
}

/** Triage as it ran at intake, with the battery's own assessment and cautions beside it. */
export interface StoredTriage extends Omit<TriageResult, 'cautions'> {
  cautions: { code: string; severity: 'info' | 'warning' | 'danger'; message: string; reason?: string }[];
  battery: BatteryAssessment | null;
}

export type ReferralCreatorType = 'user' | 'api_key';

/** A case: one device a shop refers to the network, from intake to return. */
@Entity('referrals')
export class Referral {
  @PrimaryGeneratedColumn('uuid') id!: string;
  /** From referral_number_seq; the reference is this number in Crockford Base 32 with its check symbol. */
  @Column({ type: 'bigint', unique: true }) referenceNumber!: string;
  @Column({ type: 'text', unique: true }) reference!: string;
  @Column({ type: 'uuid' }) partnerOrganizationId!: string;
  @ManyToOne(() => Organization, { onDelete: 'RESTRICT' })
  @JoinColumn({ name: 'partner_organization_id' })
  partnerOrganization?: Organization;
  @Column({ type: 'text', nullable: true }) externalRef!: string | null;
  @Column({ type: 'text' }) status!: CaseStatus;

  @Column({ type: 'text' }) customerName!: string;
  @Column({ type: 'text' }) customerEmail!: string;
  @Column({ type: 'text', nullable: true }) customerPhone!: string | null;

  @Column({ type: 'text' }) mediaType!: MediaType;
  @Column({ type: 'double precision', nullable: true }) capacityGb!: number | null;
  @Column({ type: 'text', nullable: true }) deviceInterface!: string | null;
  @Column({ type: 'text', nullable: true }) deviceMake!: string | null;
  @Column({ type: 'text', nullable: true }) deviceModel!: string | null;
  @Column({ type: 'text', nullable: true }) deviceSerial!: string | null;
  @Column({ type: 'integer', nullable: true }) memberCount!: number | null;

  @Column({ type: 'text', array: true, default: () => `'{}'` }) symptoms!: Symptom[];
  @Column({ type: 'text', nullable: true }) description!: string | null;
  /** In the order the customer gave them, most important first. */
  @Column({ type: 'jsonb', default: () => `'[]'::jsonb` }) priorities!: StoredPriority[];
  @Column({ type: 'text', array: true, default: () => `'{}'` }) sensitivity!: SensitivityFlag[];
  @Column({ type: 'jsonb', nullable: true }) battery!: StoredBattery | null;

  @Column({ type: 'text', nullable: true }) originLine1!: string | null;
  @Column({ type: 'text', nullable: true }) originCity!: string | null;
  @Column({ type: 'text', nullable: true }) originRegion!: string | null;
  @Column({ type: 'text' }) originPostalCode!: string;
  @Column({ type: 'text' }) originCountry!: string;
  @Column({ type: 'double precision' }) originLat!: number;
  @Column({ type: 'double precision' }) originLon!: number;

  @Column({ type: 'timestamptz', nullable: true }) consentRecordedAt!: Date | null;
  @Column({ type: 'text', nullable: true }) consentRecordedBy!: string | null;

  @Column({ type: 'jsonb' }) triage!: StoredTriage;
  /** The lab that accepted the case. */
  @Column({ type: 'uuid', nullable: true }) labOrganizationId!: string | null;
  @ManyToOne(() => Organization, { onDelete: 'RESTRICT' })
  @JoinColumn({ name: 'lab_organization_id' })
  labOrganization?: Organization | null;
  @Column({ type: 'text', nullable: true }) attentionReason!: string | null;

  @Column({ type: 'text' }) createdByType!: ReferralCreatorType;
  @Column({ type: 'text' }) createdById!: string;
  @Column({ type: 'text' }) createdByName!: string;
  @Column({ type: 'text', nullable: true }) idempotencyKey!: string | null;
  @Column({ type: 'text', nullable: true }) idempotencyHash!: string | null;
  @Column({ type: 'timestamptz', nullable: true }) cancelledAt!: Date | null;
  @CreateDateColumn({ type: 'timestamptz' }) createdAt!: Date;
  @UpdateDateColumn({ type: 'timestamptz' }) updatedAt!: Date;
}

export type TimelineActorType = 'user' | 'api_key' | 'system' | 'customer' | 'carrier';

/** One step in the life of a case, with who did it and when. Append-only. */
@Entity('referral_timeline')
export class TimelineEntry {
  @PrimaryGeneratedColumn('uuid') id!: string;
  /** Insertion order, to keep entries written in one transaction (same `at`) in order. */
  @Column({ type: 'bigint', insert: false, update: false }) position!: string;
  @Column({ type: 'uuid' }) referralId!: string;
  @Column({ type: 'timestamptz' }) at!: Date;
  @Column({ type: 'text' }) kind!: string;
  @Column({ type: 'text' }) summary!: string;
  @Column({ type: 'text' }) actorType!: TimelineActorType;
  @Column({ type: 'text', nullable: true }) actorId!: string | null;
  @Column({ type: 'text' }) actorName!: string;
  @Column({ type: 'jsonb', default: () => `'{}'::jsonb` }) details!: Record<string, unknown>;
}
