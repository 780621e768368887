import { Column, CreateDateColumn, Entity, PrimaryGeneratedColumn } from 'typeorm';
import type { BatteryConditionSeen } from '@shared/schemas/shipping';

/** A box opened at the lab: its condition, seal, contents and battery as the clerk saw them. */
@Entity('check_ins')
export class CheckIn {
  @PrimaryGeneratedColumn('uuid') id!: string;
  @Column({ type: 'uuid' }) referralId!: string;
  @Column({ type: 'uuid', nullable: true }) shipmentId!: string | null;
  @Column({ type: 'uuid' }) labOrganizationId!: string;
  @Column({ type: 'text' }) boxCondition!: 'intact' | 'damaged';
  @Column({ type: 'boolean' }) sealPresent!: boolean;
  @Column({ type: 'text', nullable: true }) sealNumber!: string | null;
  @Column({ type: 'boolean', nullable: true }) sealIntact!: boolean | null;
  @Column({ type: 'boolean' }) contentsMatch!: boolean;
  @Column({ type: 'text', nullable: true }) contentsNote!: string | null;
  @Column({ type: 'text', nullable: true }) batteryCondition!: BatteryConditionSeen | null;
  @Column({ type: 'text', nullable: true }) note!: string | null;
  @Column({ type: 'text' }) outcome!: 'received' | 'on_hold';
  @Column({ type: 'text', nullable: true }) holdReason!: string | null;
  @Column({ type: 'uuid', nullable: true }) checkedInByUserId!: string | null;
  @Column({ type: 'text' }) checkedInByName!: string;
  @Column({ type: 'timestamptz', default: () => 'now()' }) checkedInAt!: Date;
}

/** A photo taken at check-in; the bytes are in blob storage under `contentHash`. */
@Entity('check_in_photos')
export class CheckInPhoto {
  @PrimaryGeneratedColumn('uuid') id!: string;
  @Column({ type: 'uuid' }) checkInId!: string;
  @Column({ type: 'text' }) contentHash!: string;
  @Column({ type: 'text' }) contentType!: string;
  @Column({ type: 'integer' }) sizeBytes!: number;
  @CreateDateColumn({ type: 'timestamptz' }) createdAt!: Date;
}

/** A lab that declined a case after its box arrived owes the next lab a transfer. */
@Entity('lab_transfers')
export class LabTransfer {
  @PrimaryGeneratedColumn('uuid') id!: string;
  @Column({ type: 'uuid' }) referralId!: string;
  @Column({ type: 'uuid' }) fromLabOrganizationId!: string;
  @Column({ type: 'text' }) reason!: string;
  @Column({ type: 'text', nullable: true }) note!: string | null;
  @Column({ type: 'text' }) status!: 'open' | 'shipped';
  @Column({ type: 'uuid', nullable: true }) shipmentId!: string | null;
  @Column({ type: 'text' }) createdByName!: string;
  @CreateDateColumn({ type: 'timestamptz' }) createdAt!: Date;
}
