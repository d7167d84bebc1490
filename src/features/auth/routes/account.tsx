import type { ReactNode } from 'react';
import { ChevronLeft } from 'lucide-react';
import { Link } from 'react-router-dom';
import { Card } from '../../../components/ui/card';
import { PageTitle } from '../../../components/ui/page-title';
import { useToast } from '../../../components/ui/toast';
import { useMe } from '../api/get-me';
import { ChangePasswordForm } from '../components/change-password-form';

/** /account: the signed-in person's own sign-in details, whatever their studios and roles. */
export function AccountRoute({ header }: { header: ReactNode }) {
  const me = useMe().data;
  const toast = useToast();
  if (!me) return null;
  return (
    <div className="min-h-dvh">
      {header}
      <main id="main" tabIndex={-1} className="mx-auto max-w-2xl px-4 py-8">
        <Link to="/studios" className="mb-3 inline-flex items-center gap-1 text-sm">
          <ChevronLeft aria-hidden="true" className="size-4" />
          Your studios
        </Link>
        <PageTitle title="Your account" description={`Signed in as ${me.user.name} (${me.user.email}).`} />
        <Card title="Password" description="Changing it signs you out on every other device; this one stays signed in. We send you an e-mail when it changes.">
          <ChangePasswordForm onDone={() => toast.show('Password changed. Other devices are signed out.')} />
        </Card>
      </main>
    </div>
  );
}
