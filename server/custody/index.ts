export { CustodyEntryRow, CustodyHead } from './entities';
export { custodyRoutes } from './routes';
export { appendCustody, organizationPlace, caseForViewer, type CustodyActor, type CustodyInput } from './service';
export { custodySigner, type CustodySigner } from './signing';
export { pdfBuffer, pdfSafe, utcStamp } from './pdf';
