export { Organization } from './entities';
export { organizationRoutes } from './routes';
export { inviteInto, toOrganizationDto } from './service';
