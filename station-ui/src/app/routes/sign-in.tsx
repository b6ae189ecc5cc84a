import { useEffect } from 'react';
import { Navigate, useNavigate, useSearchParams } from 'react-router-dom';
import { pageForPathname, safeNextPath } from '@/config/paths';
import { SignInPage } from '@/features/auth/components/sign-in-page';
import { canOpen, homePathFor, sessionNotice, useUser, type AuthUser } from '@/lib/auth';

/** Back to where the person was headed, unless that page is not theirs (then their own start page). */
function destinationFor(user: AuthUser, next: string | null): string {
  if (!next || next === '/') return homePathFor(user);
  const page = pageForPathname(next.split('?')[0]);
  return !page || canOpen(user, page) ? next : homePathFor(user);
}

export default function SignInRoute() {
  const [params] = useSearchParams();
  const navigate = useNavigate();
  const { data: user } = useUser();
  const next = safeNextPath(params.get('next'));
  const notice = sessionNotice.get() ?? undefined;

  useEffect(() => {
    document.title = 'Sign in · Railwright';
  }, []);

  if (user) return <Navigate to={destinationFor(user, next)} replace />;
  return (
    <SignInPage
      notice={notice}
      onSignedIn={(u) => {
        sessionNotice.clear();
        void navigate(destinationFor(u, next), { replace: true });
      }}
    />
  );
}
