import { AsyncLocalStorage } from 'node:async_hooks';
import pino from 'pino';

// Every log line carries the request id (or the job's) through AsyncLocalStorage.
export const requestContext = new AsyncLocalStorage<{ requestId: string }>();

export const logger = pino({
  level: 'info', // set from the configuration at start (setLogLevel)
  base: { service: 'platterpost' },
  mixin() {
    const ctx = requestContext.getStore();
    return ctx ? { requestId: ctx.requestId } : {};
  },
  redact: { paths: ['req.headers.authorization', 'req.headers.cookie', 'password', '*.password'], remove: true },
});

export function setLogLevel(level: string) {
  logger.level = level;
}

export function currentRequestId(): string | undefined {
  return requestContext.getStore()?.requestId;
}
