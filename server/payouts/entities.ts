import { Column, CreateDateColumn, Entity, PrimaryColumn, PrimaryGeneratedColumn, UpdateDateColumn } from 'typeorm';
import type { StatementStatus } from '@shared/schemas/money';
import { minorUnits, type PayeeKind } from '../ledger/entities';

/** A shop's or lab's connected account at the payment provider, where its payouts go. */
@Entity('payout_accounts')
export class PayoutAccount {
  @PrimaryColumn({ type: 'uuid' }) organizationId!: string;
  @Column({ type: 'text' }) providerAccountId!: string;
  @Column({ type: 'boolean', default: false }) chargesEnabled!: boolean;
  @Column({ type: 'boolean', default: false }) payoutsEnabled!: boolean;
  @Column({ type: 'boolean', default: false }) detailsSubmitted!: boolean;
  @Column({ type: 'text', array: true, default: () => `'{}'` }) requirementsDue!: string[];
  /** The provider's time for the state above (an event's `created`), so late old events change nothing. */
  @Column({ type: 'timestamptz', default: () => 'now()' }) statusAsOf!: Date;
  @CreateDateColumn({ type: 'timestamptz' }) createdAt!: Date;
  @UpdateDateColumn({ type: 'timestamptz' }) updatedAt!: Date;
}

export type SettlementTrigger = 'manual' | 'schedule' | 'retry';
export type SettlementRunStatus = 'running' | 'completed' | 'completed_with_failures' | 'interrupted';

export interface SettlementRunSummary {
  statementsCreated: number;
  paid: number;
  failed: number;
  waitingForAccount: number;
  carriedForward: number;
  paidMinorByCurrency: Record<string, number>;
}

/** One run of the settlement for a period (a period may be run again; each run is kept). */
@Entity('settlement_runs')
export class SettlementRun {
  @PrimaryGeneratedColumn('uuid') id!: string;
  @Column({ type: 'text' }) period!: string;
  @Column({ type: 'text' }) trigger!: SettlementTrigger;
  @Column({ type: 'uuid', array: true, nullable: true }) scope!: string[] | null;
  @Column({ type: 'uuid', nullable: true }) startedById!: string | null;
  @Column({ type: 'text' }) status!: SettlementRunStatus;
  @Column({ type: 'timestamptz', default: () => 'now()' }) startedAt!: Date;
  @Column({ type: 'timestamptz', nullable: true }) finishedAt!: Date | null;
  @Column({ type: 'jsonb', default: () => `'{}'::jsonb` }) summary!: SettlementRunSummary;
}

/**
 * A payee's statement for a period and currency: its lines, what was carried in, and the one payout it
 * makes. The payout's state lives here, so a run that stops half way knows what is left to do.
 */
@Entity('statements')
export class Statement {
  @PrimaryGeneratedColumn('uuid') id!: string;
  @Column({ type: 'uuid' }) organizationId!: string;
  @Column({ type: 'text' }) payeeKind!: PayeeKind;
  @Column({ type: 'text' }) period!: string;
  @Column({ type: 'char', length: 3 }) currency!: string;
  @Column({ type: 'uuid' }) runId!: string;
  @Column({ type: 'integer', default: 0 }) lineCount!: number;
  @Column({ type: 'bigint', default: 0, transformer: minorUnits }) openingCarryMinor!: number;
  @Column({ type: 'bigint', default: 0, transformer: minorUnits }) linesTotalMinor!: number;
  @Column({ type: 'bigint', default: 0, transformer: minorUnits }) totalMinor!: number;
  @Column({ type: 'bigint', default: 0, transformer: minorUnits }) payoutMinor!: number;
  @Column({ type: 'bigint', default: 0, transformer: minorUnits }) carryForwardMinor!: number;
  @Column({ type: 'uuid', nullable: true }) carriedIntoStatementId!: string | null;
  @Column({ type: 'text' }) status!: StatementStatus | 'preparing';
  /** `settlement:<payee>:<period>`: the provider replays the first transfer made with it. */
  @Column({ type: 'text' }) idempotencyKey!: string;
  /** The same text, set on the transfer, so it can be found again after the key has expired. */
  @Column({ type: 'text' }) transferGroup!: string;
  @Column({ type: 'text', nullable: true }) transferId!: string | null;
  @Column({ type: 'integer', default: 0 }) attempts!: number;
  @Column({ type: 'text', nullable: true }) lastError!: string | null;
  @Column({ type: 'timestamptz', nullable: true }) nextAttemptAt!: Date | null;
  @Column({ type: 'timestamptz', nullable: true }) claimedAt!: Date | null;
  @Column({ type: 'timestamptz', nullable: true }) paidAt!: Date | null;
  @Column({ type: 'uuid', nullable: true }) payoutTransactionId!: string | null;
  @CreateDateColumn({ type: 'timestamptz' }) createdAt!: Date;
  @UpdateDateColumn({ type: 'timestamptz' }) updatedAt!: Date;
}

/** A provider event we have handled; its id as the key makes a second delivery a no-op. */
@Entity('payment_webhook_events')
export class PaymentWebhookEvent {
  @PrimaryColumn({ type: 'text' }) eventId!: string;
  @Column({ type: 'text' }) type!: string;
  @Column({ type: 'timestamptz' }) providerCreatedAt!: Date;
  @Column({ type: 'timestamptz', default: () => 'now()' }) receivedAt!: Date;
}
