import { Column, CreateDateColumn, Entity, PrimaryGeneratedColumn } from 'typeorm';

/**
 * A job to hand to the queue, written in the same transaction as the change that needs it (an offer and
 * its deadline), and relayed to pg-boss by the workers; so a rolled-back change schedules nothing and a
 * committed one is never without its job.
 */
@Entity('job_outbox')
export class JobOutboxRow {
  @PrimaryGeneratedColumn('uuid') id!: string;
  @Column({ type: 'text' }) queue!: string;
  @Column({ type: 'jsonb', default: () => `'{}'::jsonb` }) data!: Record<string, unknown>;
  @Column({ type: 'timestamptz', default: () => 'now()' }) startAfter!: Date;
  @Column({ type: 'text', nullable: true }) singletonKey!: string | null;
  @Column({ type: 'text', nullable: true }) requestId!: string | null;
  @Column({ type: 'integer', default: 0 }) attempts!: number;
  @Column({ type: 'text', nullable: true }) lastError!: string | null;
  @Column({ type: 'timestamptz', nullable: true }) relayedAt!: Date | null;
  @Column({ type: 'uuid', nullable: true }) jobId!: string | null;
  @CreateDateColumn({ type: 'timestamptz' }) createdAt!: Date;
}
