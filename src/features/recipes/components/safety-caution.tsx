import { TriangleAlert } from 'lucide-react';
import { defaultHazards, SAFETY_FOOTER, stripFooter, type HazardKey } from '../../../../shared/hazards';
import type { Hazard } from '../../../../shared/schemas/commissions';
import { cn } from '../../../lib/cn';

/**
 * The caution for a step that sprays, uses solvents or raises pigment dust: calm, bordered, the
 * hazard first, the studio's own text, and the closing sentence once.
 */
export function SafetyCaution({ keys, texts, className }: { keys: HazardKey[]; texts: Hazard[] | undefined; className?: string }) {
  if (keys.length === 0) return null;
  const items = keys.map((k) => texts?.find((h) => h.key === k) ?? defaultHazards.find((h) => h.key === k)!);
  return (
    <aside aria-label="Safety" className={cn('rounded-control border border-sable-600 bg-bone-50 p-3 text-sm', className)}>
      <ul className="flex flex-col gap-2">
        {items.map((h) => (
          <li key={h.key} className="flex gap-2">
            <TriangleAlert aria-hidden="true" className="mt-0.5 size-4 shrink-0 text-sable-600" />
            <span>
              <strong className="font-semibold">{h.title}:</strong> {stripFooter(h.text)}
            </span>
          </li>
        ))}
      </ul>
      <p className="mt-2 text-sable-600">{SAFETY_FOOTER}</p>
    </aside>
  );
}
