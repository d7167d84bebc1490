import { NavLink } from 'react-router-dom';
import { cn } from '../../lib/cn';

/** Tabs between the screens of one rail entry (links, so each has its own address). */
export function SubNav({ label, items }: { label: string; items: { to: string; label: string; end?: boolean }[] }) {
  return (
    <nav aria-label={label} className="mb-5 flex gap-1 overflow-x-auto border-b border-primer-300">
      {items.map((item) => (
        <NavLink
          key={item.to}
          to={item.to}
          end={item.end}
          className={({ isActive }) =>
            cn(
              '-mb-px border-b-2 px-3 py-2 text-sm font-medium whitespace-nowrap no-underline',
              isActive ? 'border-verdigris-600 text-sable-900' : 'border-transparent text-sable-600 hover:text-sable-900',
            )
          }
        >
          {item.label}
        </NavLink>
      ))}
    </nav>
  );
}
