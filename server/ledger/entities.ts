import { Column, CreateDateColumn, Entity, PrimaryGeneratedColumn, type ValueTransformer } from 'typeorm';

/** bigint columns hold minor units; pg hands them over as strings, we hold them as safe integers. */
export const minorUnits: ValueTransformer = {
  to: (value: number | null | undefined) => value,
  from: (value: string | null) => {
    if (value === null || value === undefined) return value;
    const n = Number(value);
    if (!Number.isSafeInteger(n)) throw new RangeError(`Amount ${value} is beyond what can be held exactly`);
    return n;
  },
};

export const ledgerAccountKinds = [
  /** Customer payments held at the payment processor on the network's behalf (debit balance). */
  'processor_clearing',
  /** What the processor charged for taking the payments (debit balance, an expense borne by the labs). */
  'processor_fees',
  /** What the network owes one lab (credit balance). */
  'lab_payable',
  /** The network's own fees (credit balance). */
  'network_revenue',
  /** Commission the network owes one shop (credit balance). */
  'partner_commission_payable',
  /** Money sent on to connected accounts of shops and labs (credit balance: it left the processor balance). */
  'transfers_out',
  /** Money returned to customers (credit balance: it left the processor balance). */
  'refunds',
] as const;
export type LedgerAccountKind = (typeof ledgerAccountKinds)[number];

@Entity('ledger_accounts')
export class LedgerAccount {
  @PrimaryGeneratedColumn('uuid') id!: string;
  @Column({ type: 'text' }) kind!: LedgerAccountKind;
  @Column({ type: 'uuid', nullable: true }) organizationId!: string | null;
  @Column({ type: 'char', length: 3 }) currency!: string;
  @CreateDateColumn({ type: 'timestamptz' }) createdAt!: Date;
}

export type LedgerTransactionKind = 'customer_payment' | 'refund' | 'payout';

/** One economic event; its entries sum to zero (checked at commit by the database). Append-only. */
@Entity('ledger_transactions')
export class LedgerTransaction {
  @PrimaryGeneratedColumn('uuid') id!: string;
  @Column({ type: 'text' }) kind!: LedgerTransactionKind;
  /** The provider's id of what happened (payment intent, refund, transfer): one transaction per id. */
  @Column({ type: 'text' }) sourceId!: string;
  @Column({ type: 'uuid', nullable: true }) referralId!: string | null;
  @Column({ type: 'char', length: 3 }) currency!: string;
  @Column({ type: 'timestamptz' }) occurredAt!: Date;
  @Column({ type: 'text' }) memo!: string;
  @Column({ type: 'jsonb', default: () => `'{}'::jsonb` }) details!: Record<string, unknown>;
  @CreateDateColumn({ type: 'timestamptz' }) createdAt!: Date;
}

/** A debit (positive) or credit (negative) of one account. */
@Entity('ledger_entries')
export class LedgerEntry {
  @PrimaryGeneratedColumn('identity', { type: 'bigint', generatedIdentity: 'ALWAYS' }) id!: string;
  @Column({ type: 'uuid' }) transactionId!: string;
  @Column({ type: 'uuid' }) accountId!: string;
  @Column({ type: 'bigint', transformer: minorUnits }) amountMinor!: number;
  @Column({ type: 'char', length: 3 }) currency!: string;
  @Column({ type: 'text' }) memo!: string;
}

export type PayeeKind = 'partner' | 'lab';
export type EarningLineKind = 'commission' | 'commission_clawback' | 'lab_share' | 'lab_share_reversal';

/**
 * What one shop (commission) or lab (its share) earns — or gives back, on a refund — on one case. The
 * sub-ledger of the payable accounts: statements are made of these lines, each linked to its case.
 */
@Entity('earning_lines')
export class EarningLine {
  @PrimaryGeneratedColumn('uuid') id!: string;
  @Column({ type: 'uuid' }) organizationId!: string;
  @Column({ type: 'text' }) payeeKind!: PayeeKind;
  @Column({ type: 'text' }) kind!: EarningLineKind;
  @Column({ type: 'uuid' }) referralId!: string;
  @Column({ type: 'uuid' }) ledgerTransactionId!: string;
  @Column({ type: 'char', length: 3 }) currency!: string;
  @Column({ type: 'bigint', transformer: minorUnits }) amountMinor!: number;
  @Column({ type: 'bigint', nullable: true, transformer: minorUnits }) baseMinor!: number | null;
  @Column({ type: 'integer', nullable: true }) basisPoints!: number | null;
  @Column({ type: 'uuid', nullable: true }) planId!: string | null;
  @Column({ type: 'integer', nullable: true }) tierIndex!: number | null;
  @Column({ type: 'integer', nullable: true }) paidReferrals!: number | null;
  @Column({ type: 'jsonb', default: () => `'{}'::jsonb` }) details!: Record<string, unknown>;
  @Column({ type: 'timestamptz' }) accruedAt!: Date;
  @Column({ type: 'uuid', nullable: true }) statementId!: string | null;
  @CreateDateColumn({ type: 'timestamptz' }) createdAt!: Date;
}
