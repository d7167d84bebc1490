import { Link } from 'react-router-dom';
import { ChevronRight, Store } from 'lucide-react';
import type { Membership } from '../../../../shared/schemas/auth';
import { Badge } from '../../../components/ui/badge';
import { EmptyState } from '../../../components/ui/empty-state';
import { ROLE_LABEL } from './role-label';

/** For people in several studios (or none yet): where to go. */
export function StudioChooser({ memberships }: { memberships: Membership[] }) {
  if (memberships.length === 0) {
    return (
      <EmptyState icon={<Store className="size-8" />} title="You are not part of a studio yet">
        When a studio invites you, the link in their e-mail brings you in. Painting for yourself?{' '}
        <span>Sign out and set up a studio of your own.</span>
      </EmptyState>
    );
  }
  return (
    <ul className="flex flex-col gap-2">
      {memberships.map((m) => (
        <li key={m.studioId}>
          <Link
            to={`/studio/${m.studioId}`}
            className="flex items-center justify-between gap-3 rounded-card border border-primer-300 bg-bone-50 p-4 text-sable-900 no-underline shadow-raised hover:border-verdigris-600"
          >
            <span className="min-w-0">
              <span className="block truncate font-semibold">{m.studioName}</span>
              <span className="mt-1 block">
                <Badge tone={m.role === 'client' ? 'info' : m.role === 'owner' ? 'success' : 'neutral'}>{ROLE_LABEL[m.role]}</Badge>
              </span>
            </span>
            <ChevronRight aria-hidden="true" className="size-5 shrink-0 text-sable-600" />
          </Link>
        </li>
      ))}
    </ul>
  );
}
