export { JobOutboxRow } from './entities';
export { enqueueJob, relayJobOutbox, startJobRelay, type EnqueueOptions, type JobRelay } from './outbox';
export { startQueue, queues, queueNames, QUEUE_SCHEMA, type QueueName } from './queue';
