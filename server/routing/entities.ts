import { Column, CreateDateColumn, Entity, PrimaryColumn, PrimaryGeneratedColumn, UpdateDateColumn } from 'typeorm';
import type { LabSkill, MediaType } from '@shared/vocabulary';
import type { CandidateDto, ExcludedDto } from '@shared/schemas/referrals';
import type { AutoAcceptRule } from '@shared/schemas/labs';
import type { ParticleSample } from '@shared/domain/clean-air';

export interface SkillOffer {
  skill: LabSkill;
  turnaroundDays: number;
}

/** What routing knows about a lab organisation beyond its address; one row per lab. */
@Entity('lab_profiles')
export class LabProfile {
  @PrimaryColumn({ type: 'uuid' }) organizationId!: string;
  @Column({ type: 'text', array: true, default: () => `'{}'` }) mediaTypes!: MediaType[];
  @Column({ type: 'jsonb', default: () => `'[]'::jsonb` }) skills!: SkillOffer[];
  @Column({ type: 'double precision' }) weeklyThroughput!: number;
  @Column({ type: 'integer' }) queueCapacity!: number;
  @Column({ type: 'text', default: '09:00' }) opensAt!: string;
  @Column({ type: 'text', default: '17:00' }) closesAt!: string;
  @Column({ type: 'integer', array: true, default: () => `'{1,2,3,4,5}'` }) workdays!: number[];
  @Column({ type: 'text', default: 'US' }) holidayCountry!: string;
  @Column({ type: 'text', nullable: true }) holidayRegion!: string | null;
  /** Signed when set. */
  @Column({ type: 'timestamptz', nullable: true }) healthDataAgreementSignedAt!: Date | null;
  @Column({ type: 'boolean', default: true }) acceptingNewCases!: boolean;
  @Column({ type: 'jsonb', default: () => `'[]'::jsonb` }) autoAcceptRules!: AutoAcceptRule[];
  @Column({ type: 'uuid', nullable: true }) updatedById!: string | null;
  @CreateDateColumn({ type: 'timestamptz' }) createdAt!: Date;
  @UpdateDateColumn({ type: 'timestamptz' }) updatedAt!: Date;
}

/** A particle-count test of a lab's clean area; every test is kept, the latest one counts. */
@Entity('clean_air_certificates')
export class CleanAirCertificate {
  @PrimaryGeneratedColumn('uuid') id!: string;
  @Column({ type: 'uuid' }) organizationId!: string;
  /** YYYY-MM-DD. */
  @Column({ type: 'date' }) testedOn!: string;
  @Column({ type: 'text' }) areaName!: string;
  @Column({ type: 'double precision' }) areaM2!: number;
  @Column({ type: 'jsonb' }) samples!: ParticleSample[];
  /** Worked out when recorded (ISO 14644-1:2015); null when the counts demonstrate no class. */
  @Column({ type: 'smallint', nullable: true }) isoClass!: number | null;
  /** Last day within the re-test interval (ISO 14644-2:2015); null without a class. */
  @Column({ type: 'date', nullable: true }) validUntil!: string | null;
  @Column({ type: 'jsonb', default: () => `'[]'::jsonb` }) problems!: string[];
  @Column({ type: 'uuid', nullable: true }) recordedById!: string | null;
  @CreateDateColumn({ type: 'timestamptz' }) createdAt!: Date;
}

export type RoutingTrigger = 'intake' | 'reoffer' | 'manual';

/** The ranking as it stood when a case was routed: candidates in order and every exclusion with reasons. */
@Entity('routing_snapshots')
export class RoutingSnapshot {
  @PrimaryGeneratedColumn('uuid') id!: string;
  @Column({ type: 'uuid' }) referralId!: string;
  @Column({ type: 'text' }) trigger!: RoutingTrigger;
  @Column({ type: 'double precision' }) originLat!: number;
  @Column({ type: 'double precision' }) originLon!: number;
  @Column({ type: 'jsonb' }) candidates!: CandidateDto[];
  @Column({ type: 'jsonb' }) excluded!: ExcludedDto[];
  @CreateDateColumn({ type: 'timestamptz' }) createdAt!: Date;
}

export type OfferStatus = 'pending' | 'accepted' | 'declined' | 'expired' | 'withdrawn';

/** A case offered to one lab until a deadline. */
@Entity('lab_offers')
export class LabOffer {
  @PrimaryGeneratedColumn('uuid') id!: string;
  @Column({ type: 'uuid' }) referralId!: string;
  @Column({ type: 'uuid' }) labOrganizationId!: string;
  @Column({ type: 'uuid', nullable: true }) routingSnapshotId!: string | null;
  @Column({ type: 'text' }) status!: OfferStatus;
  @Column({ type: 'integer', nullable: true }) rank!: number | null;
  @Column({ type: 'double precision', nullable: true }) distanceKm!: number | null;
  @Column({ type: 'double precision', nullable: true }) estimatedDays!: number | null;
  @Column({ type: 'timestamptz' }) offeredAt!: Date;
  @Column({ type: 'timestamptz' }) deadline!: Date;
  @Column({ type: 'timestamptz', nullable: true }) respondedAt!: Date | null;
  @Column({ type: 'uuid', nullable: true }) respondedByUserId!: string | null;
  @Column({ type: 'text', nullable: true }) respondedByName!: string | null;
  @Column({ type: 'boolean', default: false }) autoAccepted!: boolean;
  @Column({ type: 'text', nullable: true }) declineReason!: string | null;
  @Column({ type: 'text', nullable: true }) declineNote!: string | null;
  /** Set when the network admin routed the case by hand. */
  @Column({ type: 'uuid', nullable: true }) assignedByUserId!: string | null;
  @CreateDateColumn({ type: 'timestamptz' }) createdAt!: Date;
  @UpdateDateColumn({ type: 'timestamptz' }) updatedAt!: Date;
}
