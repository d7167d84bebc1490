import { Link } from 'react-router-dom';
import { cn } from '../../lib/cn';

/** Our brush mark and name. */
export function BrandMark({ className }: { className?: string }) {
  return (
    <svg viewBox="0 0 32 32" aria-hidden="true" className={cn('size-7', className)}>
      <rect width="32" height="32" rx="7" fill="#F1EFEC" stroke="#D6D2CC" />
      <g transform="rotate(45 16 16)">
        <rect x="13.9" y="0.5" width="4.2" height="12" rx="2.1" fill="#2B211C" />
        <rect x="13.4" y="11.5" width="5.2" height="5.4" rx="0.8" fill="#D6D2CC" stroke="#6B4F3F" strokeWidth="0.7" />
        <path d="M13.6 16.9 C12.9 21.5 14.4 26.4 16 30.8 C17.6 26.4 19.1 21.5 18.4 16.9 Z" fill="#6B4F3F" />
        <path d="M14.2 23.4 C14.8 26.2 15.4 28.6 16 30.8 C16.6 28.6 17.2 26.2 17.8 23.4 C16.6 24 15.4 24 14.2 23.4 Z" fill="#286B5E" />
      </g>
    </svg>
  );
}

export function BrandLink({ to = '/' }: { to?: string }) {
  return (
    <Link to={to} className="inline-flex items-center gap-2 rounded-control font-semibold text-sable-900 no-underline">
      <BrandMark />
      <span className="text-base">Sablework</span>
    </Link>
  );
}
