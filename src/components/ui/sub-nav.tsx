import { NavLink } from 'react-router-dom';
import { cn } from '../../lib/cn';

/**
 * Tabs between the screens of one rail entry (links, so each has its own address). On a narrow screen the tabs
 * wrap onto a second row rather than run off the edge, so every one of them stays in sight.
 */
export function SubNav({ label, items, className }: { label: string; items: readonly { to: string; label: string; end?: boolean }[]; className?: string }) {
  return (
    <nav aria-label={label} className={cn('mb-5 border-b border-primer-300', className)}>
      <ul className="flex flex-wrap gap-x-1">
        {items.map((item) => (
          <li key={item.to}>
            <NavLink
              to={item.to}
              end={item.end}
              className={({ isActive }) =>
                cn(
                  '-mb-px inline-flex min-h-10 items-center border-b-2 px-2 text-sm font-medium whitespace-nowrap no-underline hover:bg-primer-100 sm:px-3',
                  isActive ? 'border-verdigris-600 text-sable-900' : 'border-transparent text-sable-600 hover:text-sable-900',
                )
              }
            >
              {item.label}
            </NavLink>
          </li>
        ))}
      </ul>
    </nav>
  );
}
