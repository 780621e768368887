import { Column, CreateDateColumn, Entity, Index, PrimaryGeneratedColumn } from 'typeorm';

/** A partner's key for /api/v1. Only the SHA-256 of the secret is kept; the prefix finds the row. */
@Entity('api_keys')
export class ApiKey {
  @PrimaryGeneratedColumn('uuid') id!: string;
  @Index() @Column({ type: 'uuid' }) organizationId!: string;
  @Column({ type: 'text' }) name!: string;
  @Column({ type: 'text', unique: true }) prefix!: string;
  @Column({ type: 'text' }) secretHash!: string;
  @Column({ type: 'uuid', nullable: true }) createdById!: string | null;
  @CreateDateColumn({ type: 'timestamptz' }) createdAt!: Date;
  @Column({ type: 'timestamptz', nullable: true }) lastUsedAt!: Date | null;
  @Column({ type: 'timestamptz', nullable: true }) revokedAt!: Date | null;
  @Column({ type: 'uuid', nullable: true }) revokedById!: string | null;
}

export type IdempotencyState = 'in_progress' | 'completed';

/**
 * One POST per (key, Idempotency-Key) for 24 hours: the request's hash, and once it has
 * finished, the answer to replay. An unfinished row holds a lease that a retry may take over.
 */
@Entity('idempotency_records')
export class IdempotencyRecord {
  @PrimaryGeneratedColumn('uuid') id!: string;
  @Column({ type: 'uuid' }) apiKeyId!: string;
  @Column({ type: 'text' }) idempotencyKey!: string;
  @Column({ type: 'text' }) method!: string;
  @Column({ type: 'text' }) path!: string;
  @Column({ type: 'text' }) requestHash!: string;
  @Column({ type: 'text' }) state!: IdempotencyState;
  @Column({ type: 'timestamptz' }) leaseUntil!: Date;
  /** Which attempt holds the lease: only that one may store its answer. */
  @Column({ type: 'uuid' }) leaseToken!: string;
  @Column({ type: 'integer', nullable: true }) responseStatus!: number | null;
  @Column({ type: 'jsonb', nullable: true }) responseBody!: unknown;
  @CreateDateColumn({ type: 'timestamptz' }) createdAt!: Date;
  @Column({ type: 'timestamptz' }) expiresAt!: Date;
}
