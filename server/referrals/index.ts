export { Referral, TimelineEntry, type StoredTriage, type StoredBattery, type TimelineActorType } from './entities';
export { referralRoutes } from './routes';
export {
  createReferral,
  getReferral,
  listReferrals,
  cancelReferral,
  openReferral,
  cancelInTransaction,
  userActor,
  previewRouting,
  listAttention,
  assignLab,
  scopeOf,
  CANCELLABLE_STATUSES,
  type ReferralActor,
  type ReferralScope,
} from './service';
export { toReferralDto, toSummaryDto } from './dto';
// Other components (shipping, receiving, lab work) add their steps to a case's timeline with this.
export { recordTimeline as addTimelineEntry, lockReferral, type TimelineActor, type TimelineInput } from '../routing';
