import { Navigate } from 'react-router';
import { useUser } from '@/lib/auth';
import { homePathFor } from '@/lib/authorization';

/** "/partner" and "/lab" are not pages: each role has its own first page. */
export default function PortalHome() {
  return <Navigate to={homePathFor(useUser().role)} replace />;
}
