import { Column, CreateDateColumn, Entity, Index, PrimaryGeneratedColumn } from 'typeorm';
import type { PartnerEventType } from '@shared/schemas/webhooks';

@Entity('webhook_endpoints')
export class WebhookEndpoint {
  @PrimaryGeneratedColumn('uuid') id!: string;
  @Index() @Column({ type: 'uuid' }) organizationId!: string;
  @Column({ type: 'text' }) url!: string;
  @Column({ type: 'text', nullable: true }) description!: string | null;
  @Column({ type: 'text', array: true }) events!: PartnerEventType[];
  /** The signing key must be readable to sign with; the database's own protection covers it at rest. */
  @Column({ type: 'text' }) secret!: string;
  @Column({ type: 'text', default: 'active' }) status!: 'active' | 'disabled';
  @Column({ type: 'timestamptz', nullable: true }) failingSince!: Date | null;
  @Column({ type: 'timestamptz', nullable: true }) disabledAt!: Date | null;
  @Column({ type: 'text', nullable: true }) disabledReason!: string | null;
  @Column({ type: 'uuid', nullable: true }) createdById!: string | null;
  @CreateDateColumn({ type: 'timestamptz' }) createdAt!: Date;
}

/** One event for one partner; its id is the webhook-id every delivery of it carries. */
@Entity('webhook_events')
export class WebhookEvent {
  @PrimaryGeneratedColumn('uuid') id!: string;
  @Index() @Column({ type: 'uuid' }) organizationId!: string;
  @Column({ type: 'text' }) type!: PartnerEventType;
  /** The exact JSON text signed and sent, so a resend is byte-for-byte the same message. */
  @Column({ type: 'text' }) payload!: string;
  @CreateDateColumn({ type: 'timestamptz' }) createdAt!: Date;
}

@Entity('webhook_deliveries')
export class WebhookDelivery {
  @PrimaryGeneratedColumn('uuid') id!: string;
  @Index() @Column({ type: 'uuid' }) endpointId!: string;
  @Column({ type: 'uuid' }) eventId!: string;
  @Column({ type: 'text', default: 'pending' }) status!: 'pending' | 'succeeded' | 'failed';
  @Column({ type: 'integer', default: 0 }) attemptCount!: number;
  @Column({ type: 'timestamptz', nullable: true }) nextAttemptAt!: Date | null;
  @Column({ type: 'timestamptz', nullable: true }) deliveredAt!: Date | null;
  @CreateDateColumn({ type: 'timestamptz' }) createdAt!: Date;
}

@Entity('webhook_attempts')
export class WebhookAttempt {
  @PrimaryGeneratedColumn('uuid') id!: string;
  @Index() @Column({ type: 'uuid' }) deliveryId!: string;
  @Column({ type: 'timestamptz' }) at!: Date;
  @Column({ type: 'integer', nullable: true }) statusCode!: number | null;
  @Column({ type: 'integer' }) durationMs!: number;
  @Column({ type: 'text', nullable: true }) error!: string | null;
}
