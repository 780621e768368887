export { ApiKey, IdempotencyRecord } from './entities';
export { apiKeyRoutes } from './api-key-routes';
export { partnerApiRoutes } from './routes';
export {
  insertApiKey,
  formatApiKey,
  parseApiKey,
  actorOfKey,
  issueOrganizationKey,
  listOrganizationKeys,
  revokeOrganizationKey,
  touchApiKey,
  type KeyAudit,
  type ApiKeyPrincipal,
  type ApiKeyActor,
} from './api-keys';
export { requireApiKey, perKeyRateLimit, apiKeyOf } from './middleware';
export { idempotency } from './idempotency';
export { openApiDocument } from './openapi';
