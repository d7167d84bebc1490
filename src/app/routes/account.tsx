import { BrandLink } from '../../components/layout/brand';
import { useMe } from '../../features/auth/api/get-me';
import { AccountRoute } from '../../features/auth/routes/account';
import { SignOutButton } from '../components/sign-out-button';
import { SkipLink } from '../components/skip-link';

/** The account screen sits outside any studio, with the top bar of the studio chooser. */
export default function AccountPage() {
  const me = useMe().data;
  return (
    <AccountRoute
      header={
        <>
          <SkipLink />
          <header className="flex min-h-14 items-center justify-between gap-3 border-b border-primer-300 bg-bone-50 px-3 sm:px-5">
            <BrandLink to="/studios" />
            <div className="flex items-center gap-3">
              <span className="hidden text-sm text-sable-600 sm:inline">{me?.user.name}</span>
              <SignOutButton />
            </div>
          </header>
        </>
      }
    />
  );
}
