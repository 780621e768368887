import { registerPaymentHandlers } from './checkout';

export { LabEvaluation, LabQuote, ImagingReport, RecoveredFileManifest, CustomerCheckout, CustomerReturnAddress } from './entities';
export { labWorkRoutes, customerRoutes } from './routes';
export { applyPayment, recordPayment, type PaymentOutcome, type ProviderPayment } from './checkout';
export { recordEvaluation, startEvaluation } from './evaluation';
export { sendQuote, approveQuote, declineQuote } from './quotes';
export { reportImaging } from './imaging';
export { uploadManifest, confirmFiles, disputeFiles } from './manifest';
export { asCustomer, setReturnAddress } from './customer';
export type { LabPrincipal } from './access';

// The payment provider's events that concern this component, on the shared webhook's dispatcher.
registerPaymentHandlers();
