import { Column, Entity, PrimaryGeneratedColumn } from 'typeorm';

export type LinkIssuerType = 'user' | 'api_key' | 'system';

/** A customer's private link to one case. Only the SHA-256 of the token is kept. */
@Entity('customer_links')
export class CustomerLink {
  @PrimaryGeneratedColumn('uuid') id!: string;
  @Column({ type: 'uuid' }) referralId!: string;
  @Column({ type: 'text' }) tokenHash!: string;
  /** Why it was issued: quote_sent, files_ready, no_recovery, shop. */
  @Column({ type: 'text' }) reason!: string;
  @Column({ type: 'timestamptz' }) issuedAt!: Date;
  @Column({ type: 'text' }) issuedByType!: LinkIssuerType;
  @Column({ type: 'text', nullable: true }) issuedById!: string | null;
  @Column({ type: 'text' }) issuedByName!: string;
  @Column({ type: 'timestamptz' }) expiresAt!: Date;
  @Column({ type: 'timestamptz', nullable: true }) lastUsedAt!: Date | null;
  @Column({ type: 'timestamptz', nullable: true }) revokedAt!: Date | null;
  @Column({ type: 'text', nullable: true }) revokedByName!: string | null;
}
