import { useEffect, useId, useRef, useState } from 'react';
import { Link } from 'react-router-dom';
import { Check, ChevronsUpDown } from 'lucide-react';
import type { Membership } from '../../../shared/schemas/auth';
import { cn } from '../../lib/cn';

const ROLE_WORD = { owner: 'Owner', painter: 'Painter', client: 'Client' } as const;

/** For people in more than one studio: a short list of links to each. */
export function StudioSwitcher({ memberships, currentId }: { memberships: Membership[]; currentId: number }) {
  const [open, setOpen] = useState(false);
  const wrap = useRef<HTMLDivElement>(null);
  const button = useRef<HTMLButtonElement>(null);
  const listId = useId();
  useEffect(() => {
    if (!open) return;
    const onDown = (e: PointerEvent) => {
      if (wrap.current && !wrap.current.contains(e.target as Node)) setOpen(false);
    };
    const onKey = (e: KeyboardEvent) => {
      if (e.key === 'Escape') {
        setOpen(false);
        button.current?.focus();
      }
    };
    document.addEventListener('pointerdown', onDown);
    document.addEventListener('keydown', onKey);
    return () => {
      document.removeEventListener('pointerdown', onDown);
      document.removeEventListener('keydown', onKey);
    };
  }, [open]);

  if (memberships.length < 2) return null;

  return (
    <div ref={wrap} className="relative">
      <button
        ref={button}
        type="button"
        aria-expanded={open}
        aria-controls={listId}
        onClick={() => setOpen((o) => !o)}
        className="inline-flex min-h-10 items-center gap-1 rounded-control border border-sable-600 bg-bone-50 px-3 text-sm font-medium hover:bg-primer-100"
      >
        <span className="hidden sm:inline">Switch studio</span>
        <span className="sm:hidden">Studios</span>
        <ChevronsUpDown aria-hidden="true" className="size-4" />
      </button>
      <div
        id={listId}
        hidden={!open}
        className="absolute right-0 z-40 mt-1 w-72 max-w-[calc(100vw-2rem)] rounded-card border border-primer-300 bg-bone-50 p-1 shadow-raised"
      >
        <p className="px-3 py-2 text-xs font-semibold text-sable-600">Your studios</p>
        <ul>
          {memberships.map((m) => {
            const current = m.studioId === currentId;
            return (
              <li key={m.studioId}>
                <Link
                  to={`/studio/${m.studioId}`}
                  onClick={() => setOpen(false)}
                  aria-current={current ? 'page' : undefined}
                  className={cn(
                    'flex items-center justify-between gap-2 rounded-control px-3 py-2 text-sm text-sable-900 no-underline hover:bg-verdigris-100',
                    current && 'bg-verdigris-100',
                  )}
                >
                  <span className="min-w-0">
                    <span className="block truncate font-medium">{m.studioName}</span>
                    <span className="block text-xs text-sable-600">{ROLE_WORD[m.role]}</span>
                  </span>
                  {current && <Check aria-hidden="true" className="size-4 shrink-0 text-verdigris-600" />}
                </Link>
              </li>
            );
          })}
        </ul>
        <Link to="/studios" onClick={() => setOpen(false)} className="mt-1 block rounded-control border-t border-primer-300 px-3 py-2 text-sm">
          All studios
        </Link>
      </div>
    </div>
  );
}
