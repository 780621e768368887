import { Column, CreateDateColumn, Entity, Index, PrimaryGeneratedColumn } from 'typeorm';

/** Security and money actions, append-only, readable by the network admin. */
@Entity('audit_events')
export class AuditEvent {
  @PrimaryGeneratedColumn('uuid') id!: string;
  @Index() @CreateDateColumn({ type: 'timestamptz' }) at!: Date;
  @Column({ type: 'text' }) action!: string;
  @Column({ type: 'uuid', nullable: true }) actorUserId!: string | null;
  @Column({ type: 'uuid', nullable: true }) organizationId!: string | null;
  @Column({ type: 'text', nullable: true }) targetType!: string | null;
  @Column({ type: 'text', nullable: true }) targetId!: string | null;
  @Column({ type: 'jsonb', default: () => `'{}'::jsonb` }) details!: Record<string, unknown>;
  @Column({ type: 'text', nullable: true }) ip!: string | null;
}
