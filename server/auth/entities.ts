import { Column, CreateDateColumn, Entity, Index, JoinColumn, ManyToOne, PrimaryGeneratedColumn, UpdateDateColumn } from 'typeorm';
import type { Role } from '@shared/vocabulary';
import { Organization } from '../organizations/entities';

export type UserStatus = 'active' | 'invited' | 'disabled';

@Entity('users')
export class User {
  @PrimaryGeneratedColumn('uuid') id!: string;
  @Column({ type: 'uuid' }) organizationId!: string;
  @ManyToOne(() => Organization, { onDelete: 'RESTRICT' })
  @JoinColumn({ name: 'organization_id' })
  organization?: Organization;
  /** Stored lower-case; unique across the network. */
  @Column({ type: 'text', unique: true }) email!: string;
  @Column({ type: 'text' }) name!: string;
  @Column({ type: 'text' }) role!: Role;
  @Column({ type: 'text', default: 'active' }) status!: UserStatus;
  @Column({ type: 'text', nullable: true }) passwordHash!: string | null;
  @Column({ type: 'integer', default: 0 }) failedSignIns!: number;
  @Column({ type: 'timestamptz', nullable: true }) lockedUntil!: Date | null;
  @Column({ type: 'timestamptz', nullable: true }) lastSignInAt!: Date | null;
  @Column({ type: 'jsonb', default: () => `'{}'::jsonb` }) notificationPreferences!: Record<string, boolean>;
  @CreateDateColumn({ type: 'timestamptz' }) createdAt!: Date;
  @UpdateDateColumn({ type: 'timestamptz' }) updatedAt!: Date;
}

/** One row per issued refresh token; rotation links a token to its successor in the same family. */
@Entity('refresh_tokens')
export class RefreshToken {
  @PrimaryGeneratedColumn('uuid') id!: string;
  @Index() @Column({ type: 'uuid' }) userId!: string;
  @Index() @Column({ type: 'uuid' }) familyId!: string;
  @Column({ type: 'text' }) tokenHash!: string;
  @Column({ type: 'timestamptz' }) expiresAt!: Date;
  @Column({ type: 'timestamptz', nullable: true }) revokedAt!: Date | null;
  @Column({ type: 'uuid', nullable: true }) replacedById!: string | null;
  @CreateDateColumn({ type: 'timestamptz' }) createdAt!: Date;
}

export type OneTimeTokenPurpose = 'password_reset' | 'invitation';

/** Password-reset and invitation links: single use, expiring, stored hashed. */
@Entity('one_time_tokens')
export class OneTimeToken {
  @PrimaryGeneratedColumn('uuid') id!: string;
  @Index() @Column({ type: 'uuid' }) userId!: string;
  @Column({ type: 'text' }) purpose!: OneTimeTokenPurpose;
  @Column({ type: 'text' }) tokenHash!: string;
  @Column({ type: 'timestamptz' }) expiresAt!: Date;
  @Column({ type: 'timestamptz', nullable: true }) usedAt!: Date | null;
  @Column({ type: 'uuid', nullable: true }) createdById!: string | null;
  @CreateDateColumn({ type: 'timestamptz' }) createdAt!: Date;
}
