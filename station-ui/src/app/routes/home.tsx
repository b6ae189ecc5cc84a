import { Navigate } from 'react-router-dom';
import { homePathFor, useUser } from '@/lib/auth';

/** The bare address sends each person to their own start page. */
export default function HomeRoute() {
  const { data: user } = useUser();
  // AppRoot only renders children once the user is known.
  return user ? <Navigate to={homePathFor(user)} replace /> : null;
}
