import { Column, CreateDateColumn, Entity, PrimaryColumn, PrimaryGeneratedColumn, UpdateDateColumn } from 'typeorm';
import type { RateDto, ShipmentKind, ShipmentStatus, ShippingModeCode } from '@shared/schemas/shipping';

/** An address as it was sent to the carrier (and printed on the label and the slip). */
export interface StoredAddress {
  name: string;
  company: string | null;
  street1: string | null;
  street2: string | null;
  city: string | null;
  state: string | null;
  zip: string;
  country: string;
  phone: string | null;
}

/** A rate as the carrier offered it, with its id at the carrier. */
export type StoredRate = RateDto;

/** One box: a prepaid label from the shop to the lab, a return, or a lab-to-lab transfer. */
@Entity('shipments')
export class Shipment {
  @PrimaryGeneratedColumn('uuid') id!: string;
  @Column({ type: 'uuid' }) referralId!: string;
  @Column({ type: 'text' }) kind!: ShipmentKind;
  @Column({ type: 'uuid', nullable: true }) fromOrganizationId!: string | null;
  /** The lab whose inbound board shows the box; the shop for a return to it; null for a return to the customer. */
  @Column({ type: 'uuid', nullable: true }) toOrganizationId!: string | null;
  @Column({ type: 'jsonb' }) fromAddress!: StoredAddress;
  @Column({ type: 'jsonb' }) toAddress!: StoredAddress;
  @Column({ type: 'text', nullable: true }) boxPreset!: string | null;
  @Column({ type: 'double precision' }) lengthIn!: number;
  @Column({ type: 'double precision' }) widthIn!: number;
  @Column({ type: 'double precision' }) heightIn!: number;
  /** Ounces, as the carrier's API counts parcel weight. */
  @Column({ type: 'double precision' }) weightOz!: number;
  @Column({ type: 'integer', nullable: true }) billableLb!: number | null;
  @Column({ type: 'smallint', nullable: true }) zone!: number | null;
  @Column({ type: 'text', nullable: true, unique: true }) providerShipmentId!: string | null;
  @Column({ type: 'jsonb', default: () => `'[]'::jsonb` }) rates!: StoredRate[];
  /** The rate a purchase was asked for; kept before the call so that a retry can find out what happened. */
  @Column({ type: 'text', nullable: true }) selectedRateId!: string | null;
  @Column({ type: 'timestamptz', nullable: true }) purchaseAttemptedAt!: Date | null;
  @Column({ type: 'integer', default: 0 }) purchaseAttempts!: number;
  @Column({ type: 'text', nullable: true }) carrier!: string | null;
  @Column({ type: 'text', nullable: true }) service!: string | null;
  @Column({ type: 'text', nullable: true }) mode!: ShippingModeCode | null;
  /** What the network paid for the label, integer minor units. */
  @Column({ type: 'integer', nullable: true }) amountMinor!: number | null;
  @Column({ type: 'text', nullable: true }) currency!: string | null;
  @Column({ type: 'text' }) status!: ShipmentStatus;
  /** Statuses never move backwards: an event of a lower rank than the current one is stale. */
  @Column({ type: 'smallint', default: 0 }) statusRank!: number;
  @Column({ type: 'text', nullable: true, unique: true }) trackingCode!: string | null;
  @Column({ type: 'text', nullable: true }) providerTrackerId!: string | null;
  @Column({ type: 'text', nullable: true }) labelPdfUrl!: string | null;
  @Column({ type: 'text', nullable: true }) publicTrackingUrl!: string | null;
  @Column({ type: 'timestamptz', nullable: true }) estimatedDeliveryAt!: Date | null;
  @Column({ type: 'timestamptz', nullable: true }) deliveredAt!: Date | null;
  /** The carrier's time of the latest scan applied. */
  @Column({ type: 'timestamptz', nullable: true }) lastEventAt!: Date | null;
  @Column({ type: 'text', nullable: true }) lastStatusDetail!: string | null;
  @Column({ type: 'text', nullable: true }) lastMessage!: string | null;
  @Column({ type: 'text', nullable: true }) lastLocation!: string | null;
  @Column({ type: 'timestamptz', nullable: true }) overdueAt!: Date | null;
  @Column({ type: 'timestamptz', nullable: true }) checkedInAt!: Date | null;
  @Column({ type: 'uuid', nullable: true }) checkInId!: string | null;
  @Column({ type: 'timestamptz', nullable: true }) lastReconciledAt!: Date | null;
  @Column({ type: 'boolean', default: false }) signatureRequired!: boolean;
  @Column({ type: 'integer', nullable: true }) declaredValueMinor!: number | null;
  @Column({ type: 'text', nullable: true }) batteryMarkText!: string | null;
  @Column({ type: 'text', nullable: true, unique: true }) sscc!: string | null;
  /** Seeded demo history: the carrier (the fake, in memory) holds nothing for it. */
  @Column({ type: 'boolean', default: false }) historical!: boolean;
  @Column({ type: 'text' }) createdByType!: 'user' | 'api_key' | 'system';
  @Column({ type: 'text', nullable: true }) createdById!: string | null;
  @Column({ type: 'text' }) createdByName!: string;
  @Column({ type: 'timestamptz', nullable: true }) boughtAt!: Date | null;
  @Column({ type: 'timestamptz', nullable: true }) voidedAt!: Date | null;
  @CreateDateColumn({ type: 'timestamptz' }) createdAt!: Date;
  @UpdateDateColumn({ type: 'timestamptz' }) updatedAt!: Date;
}

/** One carrier scan of a shipment, from a webhook event or a tracker read. */
@Entity('shipment_scans')
export class ShipmentScan {
  @PrimaryGeneratedColumn('uuid') id!: string;
  @Column({ type: 'uuid' }) shipmentId!: string;
  @Column({ type: 'timestamptz' }) occurredAt!: Date;
  @Column({ type: 'text' }) status!: string;
  @Column({ type: 'text', nullable: true }) statusDetail!: string | null;
  @Column({ type: 'text' }) message!: string;
  @Column({ type: 'text', nullable: true }) location!: string | null;
  @CreateDateColumn({ type: 'timestamptz' }) createdAt!: Date;
}

export type WebhookOutcome = 'applied' | 'stale' | 'unknown_tracker' | 'ignored';

/** A tracking event id we have handled; the same event twice has one effect. */
@Entity('shipping_webhook_events')
export class ShippingWebhookEvent {
  @PrimaryColumn({ type: 'text' }) eventId!: string;
  @Column({ type: 'text' }) description!: string;
  @Column({ type: 'uuid', nullable: true }) shipmentId!: string | null;
  @Column({ type: 'text' }) outcome!: WebhookOutcome;
  @CreateDateColumn({ type: 'timestamptz' }) receivedAt!: Date;
}
