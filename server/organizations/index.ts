export { Organization } from './entities';
export { organizationRoutes } from './routes';
export { toOrganizationDto } from './service';
