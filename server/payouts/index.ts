export { PayoutAccount, SettlementRun, Statement, PaymentWebhookEvent } from './entities';
export type { SettlementRunSummary, SettlementTrigger } from './entities';
export { paymentsClient } from './client';
// The provider's events: one route, and a dispatcher other components register their handlers on.
export { onPaymentEvent, dispatchPaymentEvent, paymentWebhookRoutes, type PaymentEventHandler } from './webhook';
export { getPayoutAccount, startOnboarding, applyAccountState, toPayoutAccountDto } from './accounts';
export { runSettlement, prepareStatementsIn, payStatement, retryPayout, retryPayoutNow, sweepPayouts, backoffMs, type PayOutcome, type RunSettlementOptions } from './settlement';
export { earningsOf, getEarnings, settlementOverview } from './reports';
export { statementCsv, statementPdf } from './documents';
export { getStatementDetail, listStatements } from './views';
export { payoutRoutes } from './routes';
export { registerPayoutJobs } from './jobs';
