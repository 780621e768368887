// Every entity the DataSource knows. A component adds its entities here.
import { AuditEvent } from '../audit/entities';
import { OneTimeToken, RefreshToken, User } from '../auth/entities';
import { OutboxMessage } from '../notifications/entities';
import { Organization } from '../organizations/entities';
import { JobOutboxRow } from '../jobs/entities';
import { Referral, TimelineEntry } from '../referrals/entities';
import { CleanAirCertificate, LabOffer, LabProfile, RoutingSnapshot } from '../routing/entities';
import { ApiKey, IdempotencyRecord } from '../partner-api/entities';
import { ReferralPhoto } from '../uploads/entities';
import { EarningLine, LedgerAccount, LedgerEntry, LedgerTransaction } from '../ledger/entities';
import { CommissionPlan, PartnerCommissionPlan } from '../commissions/entities';
import { PaymentWebhookEvent, PayoutAccount, SettlementRun, Statement } from '../payouts/entities';
import { WebhookAttempt, WebhookDelivery, WebhookEndpoint, WebhookEvent } from '../webhooks/entities';
import { CustomerCheckout, CustomerReturnAddress, ImagingReport, LabEvaluation, LabQuote, RecoveredFileManifest } from '../lab-work/entities';
import { CustomerLink } from '../customer-link/entities';
import { Shipment, ShipmentScan, ShippingWebhookEvent } from '../shipping/entities';
import { CheckIn, CheckInPhoto, LabTransfer } from '../receiving/entities';
import { CustodyEntryRow, CustodyHead } from '../custody/entities';
import { MediaDisposition, SanitizationCertificate } from '../disposition/entities';

export const entities = [
  Organization,
  User,
  RefreshToken,
  OneTimeToken,
  OutboxMessage,
  AuditEvent,
  ApiKey,
  IdempotencyRecord,
  LabProfile,
  CleanAirCertificate,
  Referral,
  TimelineEntry,
  RoutingSnapshot,
  LabOffer,
  JobOutboxRow,
  ReferralPhoto,
  WebhookEndpoint,
  WebhookEvent,
  WebhookDelivery,
  WebhookAttempt,
  LabEvaluation,
  LabQuote,
  ImagingReport,
  RecoveredFileManifest,
  CustomerCheckout,
  CustomerReturnAddress,
  CustomerLink,
  Shipment,
  ShipmentScan,
  ShippingWebhookEvent,
  CheckIn,
  CheckInPhoto,
  LabTransfer,
  LedgerAccount,
  LedgerTransaction,
  LedgerEntry,
  EarningLine,
  CommissionPlan,
  PartnerCommissionPlan,
  PayoutAccount,
  SettlementRun,
  Statement,
  PaymentWebhookEvent,
  CustodyEntryRow,
  CustodyHead,
  MediaDisposition,
  SanitizationCertificate,
];
