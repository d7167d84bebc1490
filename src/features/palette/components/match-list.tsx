import { Link } from 'react-router-dom';
import type { PaintMatchView } from '../../../../shared/schemas/paints';
import { Badge } from '../../../components/ui/badge';
import { Swatch } from '../../../components/ui/swatch';
import { useStudioScope } from '../../../lib/studio-scope';

const bandTone = { 'very close': 'success', close: 'neutral', far: 'neutral' } as const;

/** The rack's nearest paints to a colour: swatch, name, ΔE00 and a plain band. */
export function MatchList({ matches, colourLabel }: { matches: PaintMatchView[]; colourLabel: string }) {
  const { studioId } = useStudioScope();
  if (matches.length === 0) return <p className="text-sm text-sable-600">The rack has no paint with a colour yet.</p>;
  return (
    <ol aria-label={`Nearest paints to ${colourLabel}`} className="flex flex-col gap-1.5">
      {matches.map((m) => (
        <li key={m.paint.id} className="flex items-center gap-2 text-sm">
          <Swatch size="sm" hex={m.paint.hex} label={`${m.paint.name}, ${m.paint.hex ?? 'no colour'}`} />
          <span className="min-w-0 flex-1">
            <Link to={`/studio/${studioId}/paints/${m.paint.id}`} className="font-medium">
              {m.paint.name}
            </Link>
            {m.paint.stockState !== 'ok' && (
              <Badge tone={m.paint.stockState === 'out' ? 'danger' : 'attention'} className="ml-1.5">
                {m.paint.stockState === 'out' ? 'Out' : 'Low'}
              </Badge>
            )}
            {m.paint.maker && <span className="block truncate text-xs text-sable-600">{m.paint.maker}</span>}
          </span>
          <span className="flex shrink-0 items-center gap-1.5">
            <span className="figures text-xs">ΔE00 {m.deltaE.toFixed(1)}</span>
            <Badge tone={bandTone[m.band]}>{m.band}</Badge>
          </span>
        </li>
      ))}
    </ol>
  );
}
