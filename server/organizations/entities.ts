import { Column, CreateDateColumn, Entity, PrimaryGeneratedColumn, UpdateDateColumn } from 'typeorm';
import type { OrganizationKind } from '@shared/vocabulary';

@Entity('organizations')
export class Organization {
  @PrimaryGeneratedColumn('uuid') id!: string;
  @Column({ type: 'text' }) kind!: OrganizationKind;
  @Column({ type: 'text' }) name!: string;
  /** Stable key for the demo seed and for URLs; unique. */
  @Column({ type: 'text', unique: true }) slug!: string;
  @Column({ type: 'text', nullable: true }) email!: string | null;
  @Column({ type: 'text', nullable: true }) phone!: string | null;
  @Column({ type: 'text', nullable: true }) addressLine1!: string | null;
  @Column({ type: 'text', nullable: true }) city!: string | null;
  @Column({ type: 'text', nullable: true }) region!: string | null;
  @Column({ type: 'text', nullable: true }) postalCode!: string | null;
  @Column({ type: 'text', default: 'US' }) country!: string;
  @Column({ type: 'double precision', nullable: true }) lat!: number | null;
  @Column({ type: 'double precision', nullable: true }) lon!: number | null;
  @Column({ type: 'text', default: 'America/New_York' }) timeZone!: string;
  @Column({ type: 'boolean', default: true }) active!: boolean;
  @CreateDateColumn({ type: 'timestamptz' }) createdAt!: Date;
  @UpdateDateColumn({ type: 'timestamptz' }) updatedAt!: Date;
}
