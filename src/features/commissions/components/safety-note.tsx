import { TriangleAlert } from 'lucide-react';
import { SAFETY_FOOTER, stripFooter, type HazardKey } from '../../../../shared/hazards';
import type { Hazard } from '../../../../shared/schemas/commissions';
import { cn } from '../../../lib/cn';

/**
 * The studio's caution for the hazards of a stage: calm, bordered, the hazard named first, and the
 * closing sentence once at the end.
 */
export function SafetyNote({ keys, hazards, className }: { keys: HazardKey[]; hazards: Hazard[] | undefined; className?: string }) {
  if (keys.length === 0) return null;
  const items = keys.map((k) => hazards?.find((h) => h.key === k) ?? { key: k, title: k, text: '' });
  return (
    <aside aria-label="Safety" className={cn('rounded-control border border-sable-600 bg-bone-50 p-3 text-sm', className)}>
      <ul className="flex flex-col gap-2">
        {items.map((h) => (
          <li key={h.key} className="flex gap-2">
            <TriangleAlert aria-hidden="true" className="mt-0.5 size-4 shrink-0 text-sable-600" />
            <span>
              <strong className="font-semibold">{h.title}.</strong> {stripFooter(h.text)}
            </span>
          </li>
        ))}
      </ul>
      <p className="mt-2 text-sable-600">{SAFETY_FOOTER}</p>
    </aside>
  );
}
