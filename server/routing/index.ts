export { LabProfile, CleanAirCertificate, RoutingSnapshot, LabOffer, type OfferStatus, type RoutingTrigger } from './entities';
export { routingRoutes } from './routes';
export { registerRoutingJobs } from './jobs';
export { loadLabs, LAB_OPEN_STATUSES, type LoadedLab } from './labs';
export { rankLabs, noCandidateReason, RANKED_SHOWN, type CaseForRouting, type Ranking } from './ranking';
export { primeLabDirectory, readDirectoryRow, DIRECTORY_READING_COLUMNS, type DirectoryReadingRow } from './directory';
export { labManagers, networkAdmins, shopUsers, type Recipient } from './notify';
export { lookupPostalCode, resolvePostalCode, type Place } from './places';
export { recordTimeline, routingActor, type TimelineActor, type TimelineInput } from './timeline';
export {
  routeAndOffer,
  makeOffer,
  withdrawPendingOffer,
  assignInTransaction,
  acceptInTransaction,
  declineInTransaction,
  expireInTransaction,
  expireOffer,
  expireOverdueOffers,
  lockReferral,
  caseForRouting,
  caseForRoutingNow,
  casesForRoutingNow,
  matchingAutoAcceptRule,
  type DispatchOutcome,
  type ExpiryResult,
} from './dispatch';
export { listLabOffers, getLabOffer, acceptOffer, declineOffer } from './offers';
export {
  getOwnLabProfile,
  updateOwnLabProfile,
  addOwnCertificate,
  getLabProfile,
  updateLabProfile,
  addLabCertificate,
  listLabs,
} from './profiles';
