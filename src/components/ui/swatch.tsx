import { cn } from '../../lib/cn';

const sizes = { sm: 'size-5', md: 'size-8', lg: 'size-12' } as const;

/**
 * A paint colour as a small square. `label` names it for screen readers ("Fen moss, #4A5D23");
 * a paint without a colour (a medium or varnish) shows as an empty, hatched square.
 */
export function Swatch({ hex, label, size = 'md', className }: { hex: string | null; label: string; size?: keyof typeof sizes; className?: string }) {
  return (
    <span
      role="img"
      aria-label={label}
      title={label}
      className={cn('inline-block shrink-0 rounded-control border border-sable-600/40', sizes[size], className)}
      style={
        hex
          ? { backgroundColor: hex }
          : { backgroundImage: 'repeating-linear-gradient(45deg, #D6D2CC 0 2px, #FBF8F3 2px 6px)' }
      }
    />
  );
}
