export { MediaDisposition, SanitizationCertificate } from './entities';
export { dispositionRoutes } from './routes';
export { readDisposition, recordDisposition, certificateUrl } from './service';
