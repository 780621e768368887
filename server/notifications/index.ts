export { OutboxMessage } from './entities';
export { enqueueEmail, dispatchOutbox } from './outbox';
export { createMailTransport } from './mailer';
export type { EmailTemplate } from './templates';
