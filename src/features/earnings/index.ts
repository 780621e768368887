// What other features may use from this one.
export { StatementStatusBadge } from './components/statement-status-badge';
