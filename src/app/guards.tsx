import type { ReactNode } from 'react';
import { Navigate, Outlet, useLocation } from 'react-router-dom';
import type { Role } from '../../shared/schemas/common';
import { ErrorNote } from '../components/ui/error-note';
import { PageTitle } from '../components/ui/page-title';
import { LoadingBlock } from '../components/ui/spinner';
import { useStudioScope } from '../lib/studio-scope';
import { useMe } from '../features/auth/api/get-me';
import { signedOutByChoice } from '../features/auth/api/session-cache';

/** Signed-in screens only; anyone else goes to sign in and comes back afterwards. */
export function RequireAuth() {
  const me = useMe();
  const location = useLocation();
  if (me.isPending) return <LoadingBlock />;
  if (me.error) {
    return (
      <div className="mx-auto max-w-md p-6">
        <ErrorNote
          title="We could not check who is signed in"
          action={
            <button type="button" className="underline" onClick={() => me.refetch()}>
              Try again
            </button>
          }
        >
          {me.error.message}
        </ErrorNote>
      </div>
    );
  }
  if (!me.data) {
    const here = location.pathname + location.search;
    const to = signedOutByChoice() || here === '/' ? '/sign-in' : `/sign-in?next=${encodeURIComponent(here)}`;
    return <Navigate to={to} replace />;
  }
  return <Outlet />;
}

/** Screens for some roles only; the rail hides them from others, this covers typed-in links. */
export function RequireRole({ roles, children }: { roles: readonly Role[]; children?: ReactNode }) {
  const { role } = useStudioScope();
  if (!roles.includes(role)) {
    return (
      <>
        <PageTitle title="Not part of your role" />
        <ErrorNote>
          {roles.length === 1 && roles[0] === 'owner'
            ? 'Only the studio’s owners can open this page. Ask an owner if you need something changed here.'
            : 'This page is not open to your role in the studio.'}
        </ErrorNote>
      </>
    );
  }
  return children ?? <Outlet />;
}
