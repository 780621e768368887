export { OutboxMessage } from './entities';
export { enqueueEmail, dispatchOutbox } from './outbox';
export { createMailTransport } from './mailer';
export { enqueueEmailToUser, wantsEmail, type UserRecipient } from './preferences';
export { notificationPreferenceRoutes } from './preference-routes';
export type { EmailTemplate } from './templates';
