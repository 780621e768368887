import { Navigate } from 'react-router';
import { paths } from '@/config/paths';
import { useSession } from '@/lib/auth';
import { homePathFor } from '@/lib/authorization';

/** "/" has no page of its own: it sends each person to where they work. */
export default function Landing() {
  const { user } = useSession();
  return <Navigate to={user ? homePathFor(user.role) : paths.auth.signIn.getHref()} replace />;
}
