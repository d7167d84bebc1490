import { Droplet, Flame, Sparkles, SprayCan, Wind, type LucideIcon } from 'lucide-react';
import type { HazardKey } from '../../../../shared/hazards';

const chips: Record<HazardKey, { icon: LucideIcon; label: string }> = {
  spray: { icon: SprayCan, label: 'Spray' },
  solvent: { icon: Flame, label: 'Solvents' },
  resin: { icon: Wind, label: 'Resin dust' },
  pigment: { icon: Sparkles, label: 'Pigments' },
  superglue: { icon: Droplet, label: 'Superglue' },
};

/** Icons always with their words; the full caution is on the commission page. */
export function HazardChips({ keys }: { keys: HazardKey[] }) {
  if (keys.length === 0) return null;
  return (
    <ul aria-label="Safety" className="flex flex-wrap gap-1">
      {keys.map((k) => {
        const c = chips[k];
        return (
          <li key={k} className="inline-flex items-center gap-1 rounded-control border border-sable-600 px-1.5 py-0.5 text-xs">
            <c.icon aria-hidden="true" className="size-3.5" />
            {c.label}
          </li>
        );
      })}
    </ul>
  );
}
