// Values the global set-up hands to every test file through vitest's provide/inject.
declare module 'vitest' {
  export interface ProvidedContext {
    databaseUrl: string;
    appUrl: string;
    /** The browser suite's shipping fake (its /_fake/clock moves tracking on). */
    shippingFakeUrl: string;
    /** The browser suite's payments fake (hosted onboarding and payment pages, /_fake controls). */
    paymentsFakeUrl: string;
    mailApiUrl: string;
    smtpPort: number;
  }
}
export {};
