import { Suspense, useEffect, useId, useRef, useState, type ReactNode } from 'react';
import { Ellipsis, UserRound } from 'lucide-react';
import { useQuery } from '@tanstack/react-query';
import { Link, Outlet, useLocation, useParams } from 'react-router-dom';
import type { Membership, MeResponse } from '../../../shared/schemas/auth';
import { BrandMark } from '../../components/layout/brand';
import { ErrorNote } from '../../components/ui/error-note';
import { LoadingBlock } from '../../components/ui/spinner';
import { isApiError } from '../../lib/api-client';
import { cn } from '../../lib/cn';
import { StudioScopeProvider } from '../../lib/studio-scope';
import { useMe } from '../../features/auth/api/get-me';
import { EmailNoticesButton } from '../../features/portal/components/email-notices';
import { studioQueryOptions } from '../../features/studios/api/get-studio';
import { RunningTimer } from '../../features/time/components/running-timer';
import { SignOutButton } from '../components/sign-out-button';
import { SkipLink } from '../components/skip-link';
import { StudioSwitcher } from '../components/studio-switcher';
import { navFor, navItemIsCurrent, type NavItem } from '../nav';

/** The path below /studio/:studioId, without slashes at the ends: '' on the studio's home. */
function useStudioRest(base: string) {
  const { pathname } = useLocation();
  return pathname.startsWith(base) ? pathname.slice(base.length).replace(/^\/+|\/+$/g, '') : pathname;
}
import { NotFoundScreen } from '../routes/not-found';

function Header({ me, membership, studioName }: { me: MeResponse; membership: Membership; studioName: string }) {
  const base = `/studio/${membership.studioId}`;
  return (
    <header className="sticky top-0 z-30 border-b border-primer-300 bg-bone-50">
      <div className="flex min-h-14 items-center gap-3 px-3 sm:px-5">
        <Link to={base} className="flex min-w-0 items-center gap-2 rounded-control text-sable-900 no-underline">
          <BrandMark className="shrink-0" />
          <span className="min-w-0">
            <span className="block truncate text-sm font-semibold sm:text-base">{studioName}</span>
            <span className="block text-xs text-sable-600">Sablework</span>
          </span>
        </Link>
        <div className="ml-auto flex items-center gap-1 sm:gap-3">
          {membership.role !== 'client' && <RunningTimer studioId={membership.studioId} />}
          <EmailNoticesButton on={me.user.emailNotices} role={membership.role} />
          <StudioSwitcher memberships={me.memberships} currentId={membership.studioId} />
          <Link to="/account" className="inline-flex min-h-10 min-w-10 items-center justify-center gap-2 rounded-control px-2 text-sm text-sable-600 no-underline hover:bg-primer-100" title={me.user.email}>
            <UserRound aria-hidden="true" className="size-5 md:hidden" />
            <span className="sr-only">Your account: </span>
            <span className="hidden max-w-48 truncate md:inline">{me.user.name}</span>
          </Link>
          <SignOutButton />
        </div>
      </div>
    </header>
  );
}

/** An entry of the rail, or of the phone's "More" panel: icon and label in a row, the current one marked. */
function ListEntry({ item, base, current, className, iconClassName }: { item: NavItem; base: string; current: boolean; className: string; iconClassName: string }) {
  return (
    <Link
      to={item.to ? `${base}/${item.to}` : base}
      aria-current={current ? 'page' : undefined}
      className={cn(
        'flex items-center gap-3 rounded-control px-3 text-sm text-sable-900 no-underline hover:bg-primer-100',
        className,
        current && 'bg-verdigris-100 font-semibold hover:bg-verdigris-100',
      )}
    >
      <item.icon aria-hidden="true" className={cn('shrink-0', iconClassName)} />
      {item.label}
    </Link>
  );
}

function Rail({ membership }: { membership: Membership }) {
  const items = navFor(membership.role);
  const base = `/studio/${membership.studioId}`;
  const rest = useStudioRest(base);
  return (
    <nav aria-label="Studio" className="hidden w-56 shrink-0 border-r border-primer-300 bg-bone-50 sm:block">
      <ul className="sticky top-14 flex flex-col gap-1 p-3">
        {items.map((item) => (
          <li key={item.label}>
            <ListEntry item={item} base={base} current={navItemIsCurrent(item, rest)} className="min-h-10" iconClassName="size-4" />
          </li>
        ))}
      </ul>
    </nav>
  );
}

/** How many entries the phone's bottom bar shows before the rest go under "More". */
const BAR_ENTRIES = 4;

/**
 * The rail becomes a bar along the bottom edge on a phone: the first entries, and "More" with the rest in a
 * panel above the bar (it closes on a choice, on Escape, or on a tap outside it). Nothing scrolls sideways.
 */
function BottomBar({ membership }: { membership: Membership }) {
  const items = navFor(membership.role);
  const base = `/studio/${membership.studioId}`;
  const rest = useStudioRest(base);
  const { pathname } = useLocation();
  // The panel is open on the screen it was opened on: a new screen closes it.
  const [openOn, setOpenOn] = useState<string | null>(null);
  const open = openOn === pathname;
  const setOpen = (o: boolean) => setOpenOn(o ? pathname : null);
  const barRef = useRef<HTMLElement>(null);
  const moreRef = useRef<HTMLButtonElement>(null);
  const panelId = useId();
  const shown = items.length > BAR_ENTRIES + 1 ? items.slice(0, BAR_ENTRIES) : items;
  const more = items.slice(shown.length);
  const moreIsCurrent = more.some((item) => navItemIsCurrent(item, rest));

  useEffect(() => {
    if (!open) return;
    const onKey = (e: KeyboardEvent) => {
      if (e.key !== 'Escape') return;
      setOpenOn(null);
      moreRef.current?.focus();
    };
    const onPointer = (e: PointerEvent) => {
      if (!barRef.current?.contains(e.target as Node)) setOpenOn(null);
    };
    document.addEventListener('keydown', onKey);
    document.addEventListener('pointerdown', onPointer);
    return () => {
      document.removeEventListener('keydown', onKey);
      document.removeEventListener('pointerdown', onPointer);
    };
  }, [open]);

  const entry = 'flex min-h-14 w-full flex-col items-center justify-center gap-0.5 px-1 text-center text-xs leading-tight text-sable-900 no-underline';
  return (
    <nav ref={barRef} aria-label="Studio" className="fixed inset-x-0 bottom-0 z-30 border-t border-primer-300 bg-bone-50 sm:hidden">
      {open && (
        <ul id={panelId} className="absolute inset-x-0 bottom-full flex flex-col gap-1 border-t border-primer-300 bg-bone-50 p-2 shadow-lg">
          {more.map((item) => (
            <li key={item.label}>
              <ListEntry item={item} base={base} current={navItemIsCurrent(item, rest)} className="min-h-12" iconClassName="size-5" />
            </li>
          ))}
        </ul>
      )}
      <ul className="flex">
        {shown.map((item) => (
          <li key={item.label} className="min-w-0 flex-1">
            <Link
              to={item.to ? `${base}/${item.to}` : base}
              aria-current={navItemIsCurrent(item, rest) ? 'page' : undefined}
              className={cn(entry, navItemIsCurrent(item, rest) && 'bg-verdigris-100 font-semibold')}
            >
              <item.icon aria-hidden="true" className="size-5" />
              {item.label}
            </Link>
          </li>
        ))}
        {more.length > 0 && (
          <li className="min-w-0 flex-1">
            <button
              ref={moreRef}
              type="button"
              aria-expanded={open}
              aria-controls={panelId}
              onClick={() => setOpen(!open)}
              className={cn(entry, 'cursor-pointer bg-transparent', (open || moreIsCurrent) && 'bg-verdigris-100 font-semibold')}
            >
              <Ellipsis aria-hidden="true" className="size-5" />
              More
            </button>
          </li>
        )}
      </ul>
    </nav>
  );
}

function Main({ children, className }: { children: ReactNode; className?: string }) {
  return (
    <main id="main" tabIndex={-1} className={cn('min-w-0 flex-1 px-4 py-6 sm:px-8 sm:py-8', className)}>
      {children}
    </main>
  );
}

/** /studio/:studioId — the frame is chosen by the caller's role in that studio. */
export function StudioLayout() {
  const { studioId: param } = useParams();
  const studioId = Number(param);
  const me = useMe().data;
  const membership = me?.memberships.find((m) => m.studioId === studioId);
  const studio = useQuery({ ...studioQueryOptions(studioId), enabled: !!membership });

  // Not a member (or no such studio): the same answer either way, as the API gives.
  if (!me || !membership) return <NotFoundScreen />;

  const studioName = studio.data?.name ?? membership.studioName;
  let content;
  if (studio.isPending) content = <LoadingBlock />;
  else if (isApiError(studio.error, 404)) return <NotFoundScreen />;
  else if (studio.error) content = <ErrorNote title="This studio did not load">{studio.error.message}</ErrorNote>;
  else
    content = (
      <StudioScopeProvider
        value={{
          studioId,
          userId: me.user.id,
          role: membership.role,
          studioName,
          timezone: studio.data.timezone,
          currency: studio.data.currency,
        }}
      >
        <Suspense fallback={<LoadingBlock />}>
          <Outlet />
        </Suspense>
      </StudioScopeProvider>
    );

  if (membership.role === 'client') {
    return (
      <div className="flex min-h-dvh flex-col">
        <SkipLink />
        <Header me={me} membership={membership} studioName={studioName} />
        <Main className="mx-auto w-full max-w-3xl">{content}</Main>
      </div>
    );
  }

  return (
    <div className="flex min-h-dvh flex-col">
      <SkipLink />
      <Header me={me} membership={membership} studioName={studioName} />
      <div className="flex flex-1">
        <Rail membership={membership} />
        <Main className="pb-24 sm:pb-8">
          <div className="mx-auto max-w-5xl">{content}</div>
        </Main>
      </div>
      <BottomBar membership={membership} />
    </div>
  );
}
