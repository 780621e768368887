import { Column, Entity, PrimaryGeneratedColumn } from 'typeorm';
import type { PhotoContentType } from './image-type';

/** A condition photo of a case's device; the bytes are in blob storage under `contentHash`. */
@Entity('referral_photos')
export class ReferralPhoto {
  @PrimaryGeneratedColumn('uuid') id!: string;
  @Column({ type: 'uuid' }) referralId!: string;
  /** SHA-256 of the bytes, also their storage key. */
  @Column({ type: 'text' }) contentHash!: string;
  /** As recognised from the bytes, not as the sender declared it. */
  @Column({ type: 'text' }) contentType!: PhotoContentType;
  @Column({ type: 'integer' }) sizeBytes!: number;
  @Column({ type: 'text' }) uploadedByType!: 'user' | 'api_key';
  @Column({ type: 'text' }) uploadedById!: string;
  @Column({ type: 'text' }) uploadedByName!: string;
  @Column({ type: 'timestamptz', default: () => 'clock_timestamp()' }) uploadedAt!: Date;
}
