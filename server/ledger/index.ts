export { LedgerAccount, LedgerTransaction, LedgerEntry, EarningLine, minorUnits, ledgerAccountKinds } from './entities';
export type { LedgerAccountKind, LedgerTransactionKind, PayeeKind, EarningLineKind } from './entities';
// For the payment component: call these in the transaction that records the payment or the refund.
export { postCustomerPayment, postRefund, type CustomerPaymentInput, type CustomerPaymentResult, type RefundInput, type RefundResult } from './payments';
export { postTransaction, balancedEntries, accountId, type TransactionInput, type EntryInput, type AccountRef } from './postings';
export { postPayout, ledgerCheck } from './service';
export { ledgerRoutes } from './routes';
