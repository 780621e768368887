import { Column, Entity, PrimaryColumn, PrimaryGeneratedColumn } from 'typeorm';
import type { CustodyAction } from '@shared/domain/custody-chain';
import type { CustodyActorType } from '@shared/schemas/custody';

/**
 * One handling of a case's original media. Append-only (a trigger refuses UPDATE and DELETE); each
 * entry's hash covers the previous entry's hash and this entry (chainHash in shared/domain).
 */
@Entity('custody_entries')
export class CustodyEntryRow {
  @PrimaryGeneratedColumn('uuid') id!: string;
  @Column({ type: 'uuid' }) referralId!: string;
  @Column({ type: 'integer' }) sequence!: number;
  @Column({ type: 'text' }) action!: CustodyAction;
  @Column({ type: 'timestamptz' }) at!: Date;
  @Column({ type: 'text' }) actorType!: CustodyActorType;
  @Column({ type: 'text', nullable: true }) actorId!: string | null;
  @Column({ type: 'text' }) actorName!: string;
  @Column({ type: 'text', nullable: true }) location!: string | null;
  @Column({ type: 'jsonb', default: () => `'{}'::jsonb` }) details!: Record<string, unknown>;
  @Column({ type: 'text', nullable: true }) previousHash!: string | null;
  @Column({ type: 'text' }) hash!: string;
  @Column({ type: 'timestamptz', default: () => 'clock_timestamp()', insert: false, update: false }) recordedAt!: Date;
}

/** The latest head of a case's chain, kept beside the log so that a removed last entry shows. */
@Entity('custody_heads')
export class CustodyHead {
  @PrimaryColumn({ type: 'uuid' }) referralId!: string;
  @Column({ type: 'integer' }) sequence!: number;
  @Column({ type: 'text' }) headHash!: string;
  @Column({ type: 'timestamptz', default: () => 'clock_timestamp()' }) updatedAt!: Date;
}
