import { Link } from 'react-router-dom';
import { BrandLink } from '../../components/layout/brand';
import { PageTitle } from '../../components/ui/page-title';
import { useMe } from '../../features/auth/api/get-me';
import { StudioChooser } from '../../features/studios/components/studio-chooser';
import { SignOutButton } from '../components/sign-out-button';
import { SkipLink } from '../components/skip-link';

export default function StudiosPage() {
  const me = useMe().data;
  if (!me) return null;
  return (
    <div className="min-h-dvh">
      <SkipLink />
      <header className="flex min-h-14 items-center justify-between gap-3 border-b border-primer-300 bg-bone-50 px-3 sm:px-5">
        <BrandLink to="/studios" />
        <div className="flex items-center gap-3">
          <Link to="/account" className="text-sm">
            Your account
          </Link>
          <SignOutButton />
        </div>
      </header>
      <main id="main" className="mx-auto max-w-xl px-4 py-8">
        <PageTitle title="Your studios" description={me.memberships.length ? 'Pick the studio to open. You can switch at any time from the top bar.' : undefined} />
        <StudioChooser memberships={me.memberships} />
      </main>
    </div>
  );
}
