export { CaseRecordPanel } from './components/case-record-panel';
export { CustodyLog, ChainStatus } from './components/custody-log';
