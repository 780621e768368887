import { registerPaymentHandlers } from './checkout';
import { registerRefundHandlers } from './refunds';

export { LabEvaluation, LabQuote, ImagingReport, RecoveredFileManifest, CustomerCheckout, CustomerReturnAddress } from './entities';
export { labWorkRoutes, customerRoutes } from './routes';
export { applyPayment, recordPayment, type PaymentOutcome, type ProviderPayment } from './checkout';
// Each step also runs in a caller's transaction (the …In forms), as the demo seed does.
export { recordEvaluation, recordEvaluationIn, startEvaluation, startEvaluationIn, type StepMeta } from './evaluation';
export { sendQuote, sendQuoteIn, approveQuote, declineQuote } from './quotes';
export { refundCase, recordRefund } from './refunds';
export { reportImaging, reportImagingIn } from './imaging';
export { uploadManifest, uploadManifestIn, confirmFiles, disputeFiles } from './manifest';
export { asCustomer, setReturnAddress } from './customer';
export type { LabPrincipal } from './access';
// For shipping: whether a case's return box may leave the lab yet.
export { returnWaitingFor } from './return-readiness';

// The payment provider's events that concern this component, on the shared webhook's dispatcher.
registerPaymentHandlers();
registerRefundHandlers();
