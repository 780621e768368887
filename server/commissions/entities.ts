import { Column, CreateDateColumn, Entity, PrimaryColumn, PrimaryGeneratedColumn, UpdateDateColumn } from 'typeorm';
import type { CommissionTier } from '@shared/domain/commission';

/**
 * A commission plan: how a referred case's recovery service lines are shared — the shop's commission in
 * tiers by its paid referrals over 90 days, and the network's fee. Both come out of the lab's share.
 */
@Entity('commission_plans')
export class CommissionPlan {
  @PrimaryGeneratedColumn('uuid') id!: string;
  @Column({ type: 'text' }) name!: string;
  @Column({ type: 'jsonb' }) tiers!: CommissionTier[];
  /** The network's own fee on the same service lines, for cases this plan's shops refer (basis points). */
  @Column({ type: 'integer', default: 0 }) networkFeeBasisPoints!: number;
  /** The plan of every shop that has none of its own; at most one. */
  @Column({ type: 'boolean', default: false }) isDefault!: boolean;
  @Column({ type: 'timestamptz', nullable: true }) archivedAt!: Date | null;
  @Column({ type: 'uuid', nullable: true }) createdById!: string | null;
  @CreateDateColumn({ type: 'timestamptz' }) createdAt!: Date;
  @UpdateDateColumn({ type: 'timestamptz' }) updatedAt!: Date;
}

/** A shop's own plan, instead of the default. */
@Entity('partner_commission_plans')
export class PartnerCommissionPlan {
  @PrimaryColumn({ type: 'uuid' }) partnerOrganizationId!: string;
  @Column({ type: 'uuid' }) planId!: string;
  @Column({ type: 'uuid', nullable: true }) assignedById!: string | null;
  @Column({ type: 'timestamptz', default: () => 'now()' }) assignedAt!: Date;
}
