import { Column, CreateDateColumn, Entity, PrimaryGeneratedColumn } from 'typeorm';

export type OutboxStatus = 'pending' | 'sent' | 'failed';

/**
 * A message to send, written in the same transaction as the change that causes it and
 * sent later by the outbox worker, so a mail server that is down delays mail, never loses it.
 */
@Entity('outbox_messages')
export class OutboxMessage {
  @PrimaryGeneratedColumn('uuid') id!: string;
  @Column({ type: 'text', default: 'email' }) channel!: 'email';
  @Column({ type: 'text' }) template!: string;
  @Column({ type: 'text' }) recipient!: string;
  @Column({ type: 'text' }) subject!: string;
  @Column({ type: 'text' }) textBody!: string;
  @Column({ type: 'text' }) htmlBody!: string;
  @Column({ type: 'text', default: 'pending' }) status!: OutboxStatus;
  @Column({ type: 'integer', default: 0 }) attempts!: number;
  @Column({ type: 'timestamptz', default: () => 'now()' }) nextAttemptAt!: Date;
  @Column({ type: 'text', nullable: true }) lastError!: string | null;
  @Column({ type: 'timestamptz', nullable: true }) sentAt!: Date | null;
  @Column({ type: 'text', nullable: true }) requestId!: string | null;
  @CreateDateColumn({ type: 'timestamptz' }) createdAt!: Date;
}
