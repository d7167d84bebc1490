import { NavLink } from 'react-router-dom';
import { cn } from '../../../lib/cn';

const TABS = [
  { to: 'money', label: 'Overview', end: true },
  { to: 'quotes', label: 'Quotes', end: false },
  { to: 'invoices', label: 'Invoices', end: false },
  { to: 'money/prices', label: 'Prices', end: false },
  { to: 'reports', label: 'The books', end: false },
] as const;

/** The owner's way around the money screens; one rail entry ("Quotes & invoices") leads here. */
export function MoneyTabs({ studioId }: { studioId: number }) {
  const base = `/studio/${studioId}`;
  return (
    <nav aria-label="Quotes and invoices" className="mb-6 overflow-x-auto border-b border-primer-300">
      <ul className="flex gap-1">
        {TABS.map((t) => (
          <li key={t.to}>
            <NavLink
              to={`${base}/${t.to}`}
              end={t.end}
              className={({ isActive }) =>
                cn(
                  '-mb-px inline-flex min-h-10 items-center border-b-2 px-3 text-sm whitespace-nowrap text-sable-900 no-underline hover:bg-primer-100',
                  isActive ? 'border-verdigris-600 font-semibold' : 'border-transparent',
                )
              }
            >
              {t.label}
            </NavLink>
          </li>
        ))}
      </ul>
    </nav>
  );
}
