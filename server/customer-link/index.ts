export { CustomerLink, type LinkIssuerType } from './entities';
export { customerLinkRoutes } from './routes';
export {
  issueCustomerLink,
  findActiveLink,
  touchLink,
  revokeCaseLinks,
  listCaseLinks,
  hashCustomerToken,
  customerCaseUrl,
  redactCustomerToken,
  systemIssuer,
  CUSTOMER_LINK_TTL_DAYS,
  type LinkIssuer,
} from './links';
