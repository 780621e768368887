export { AuditEvent } from './entities';
export { recordAudit, type AuditInput } from './service';
export { auditRoutes } from './routes';
