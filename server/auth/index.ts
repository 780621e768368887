export { User, RefreshToken, OneTimeToken } from './entities';
export { createGuard, actorOf, type Guard } from './guard';
export { authRoutes, REFRESH_COOKIE } from './routes';
export { hashPassword } from './passwords';
export { issueOneTimeToken, toSessionUser } from './service';
