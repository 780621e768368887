// Values the global set-up hands to every test file through vitest's provide/inject.
declare module 'vitest' {
  export interface ProvidedContext {
    databaseUrl: string;
    appUrl: string;
    /** The browser suite's shipping fake (its /_fake/clock moves tracking on). */
    shippingFakeUrl: string;
    mailApiUrl: string;
    smtpPort: number;
  }
}
export {};
