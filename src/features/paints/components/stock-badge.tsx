import type { Paint } from '../../../../shared/schemas/paints';
import { Badge } from '../../../components/ui/badge';

export function StockBadge({ paint }: { paint: Pick<Paint, 'stock' | 'stockState'> }) {
  if (paint.stockState === 'out') return <Badge tone="danger">Out</Badge>;
  if (paint.stockState === 'low') return <Badge tone="attention">Low</Badge>;
  return null;
}
