import { Brush, CalendarClock, ClipboardList, Palette, Receipt, Users } from 'lucide-react';
import type { ReactNode } from 'react';
import { ButtonLink } from '../../../components/ui/button';
import { Card } from '../../../components/ui/card';
import { EmptyState } from '../../../components/ui/empty-state';
import { PageTitle } from '../../../components/ui/page-title';
import { formatDate } from '../../../lib/format';
import { useStudioScope } from '../../../lib/studio-scope';

function firstName(name: string): string {
  return name.trim().split(/\s+/)[0] ?? name;
}

function Coming({ icon, title, children }: { icon: ReactNode; title: string; children: ReactNode }) {
  return (
    <li className="flex gap-3 rounded-card border border-primer-300 bg-bone-50 p-4">
      <span aria-hidden="true" className="mt-0.5 text-verdigris-600">
        {icon}
      </span>
      <span>
        <span className="block font-semibold">{title}</span>
        <span className="block text-sm text-sable-600">{children}</span>
      </span>
    </li>
  );
}

/** Owners and painters land here; the real board arrives with the commissions work. */
export function StudioHomeRoute({ userName }: { userName: string }) {
  const { studioName, role, timezone } = useStudioScope();
  const today = formatDate(new Date(), timezone);

  if (role === 'owner') {
    return (
      <>
        <PageTitle title={`Hello, ${firstName(userName)}`} description={`${studioName} · ${today}`} />
        <div className="flex flex-col gap-6">
          <Card title="Getting the studio ready" description="A few first steps; the rest of the bench follows.">
            <div className="flex flex-wrap gap-2">
              <ButtonLink to="clients">
                <Users aria-hidden="true" className="size-4" />
                Add your clients
              </ButtonLink>
              <ButtonLink to="team" variant="secondary">
                Invite a painter
              </ButtonLink>
              <ButtonLink to="settings" variant="secondary">
                Check the studio settings
              </ButtonLink>
            </div>
          </Card>
          <section aria-labelledby="coming-title">
            <h2 id="coming-title" className="mb-3 text-lg font-semibold">
              On its way to this page
            </h2>
            <ul className="grid gap-3 sm:grid-cols-2">
              <Coming icon={<ClipboardList className="size-5" />} title="Commissions">
                Every order from enquiry to shipped, with what waits on whom.
              </Coming>
              <Coming icon={<Receipt className="size-5" />} title="Quotes and invoices">
                Deposits taken, balances due, and what the studio earns per hour.
              </Coming>
              <Coming icon={<Brush className="size-5" />} title="The bench">
                Figures by stage, and the time logged on each.
              </Coming>
              <Coming icon={<CalendarClock className="size-5" />} title="Calendar">
                When the queue lets you promise a delivery.
              </Coming>
            </ul>
          </section>
        </div>
      </>
    );
  }

  return (
    <>
      <PageTitle title={`Hello, ${firstName(userName)}`} description={`Your bench at ${studioName} · ${today}`} />
      <div className="flex flex-col gap-6">
        <EmptyState icon={<Brush className="size-8" />} title="Nothing assigned to you yet">
          When figures are booked onto your bench, they show here by stage, ready for you to log time and photos.
        </EmptyState>
        <ul className="grid gap-3 sm:grid-cols-2">
          <Coming icon={<Palette className="size-5" />} title="Paints and recipes">
            The studio&apos;s rack and the recipes for each scheme, step by step.
          </Coming>
          <Coming icon={<Users className="size-5" />} title="Clients">
            <ButtonLink to="clients" variant="ghost" size="sm" className="-ml-3">
              See who the studio paints for
            </ButtonLink>
          </Coming>
        </ul>
      </div>
    </>
  );
}

/** The client's portal home, until their commissions can be listed. */
export function ClientHomeRoute({ userName }: { userName: string }) {
  const { studioName } = useStudioScope();
  return (
    <>
      <PageTitle title="My commissions" description={`Hello, ${firstName(userName)} — this is your corner of ${studioName}.`} />
      <EmptyState icon={<Brush className="size-8" />} title="Nothing on the bench for you yet">
        Once {studioName} books your figures, you can follow them here from primer to varnish: progress photos, the colour scheme to approve,
        and the invoice when they are ready to ship.
      </EmptyState>
    </>
  );
}
