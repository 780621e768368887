// What other features may use from referrals.
export { CaseStatusBadge } from './components/case-status-badge';
export { CautionList, cautionFootnote, type CautionItem } from './components/caution-list';
export { PhotoGallery } from './components/case-photos';
export { RoutingOverview } from './components/routing-overview';
export { interfaceLabels } from './utils/labels';
