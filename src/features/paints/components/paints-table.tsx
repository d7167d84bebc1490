import { Link } from 'react-router-dom';
import { finishLabels, paintTypeLabels, type Paint } from '../../../../shared/schemas/paints';
import { Swatch } from '../../../components/ui/swatch';
import { Table, TBody, Td, Th, THead, Tr } from '../../../components/ui/table';
import { StockBadge } from './stock-badge';

export function PaintsTable({ paints, caption }: { paints: Paint[]; caption: string }) {
  return (
    <Table caption={caption}>
      <THead>
        <Tr>
          <Th className="w-12">
            <span className="sr-only">Colour</span>
          </Th>
          <Th>Paint</Th>
          <Th className="hidden md:table-cell">Type</Th>
          <Th className="hidden lg:table-cell">Finish</Th>
          <Th className="hidden sm:table-cell">Hex</Th>
          <Th className="text-right">Pots</Th>
          <Th className="hidden lg:table-cell text-right">Recipes</Th>
        </Tr>
      </THead>
      <TBody>
        {paints.map((p) => (
          <Tr key={p.id} className="hover:bg-verdigris-100">
            <Td>
              <Swatch hex={p.hex} label={p.hex ? `${p.name}, ${p.hex}` : `${p.name}, no colour`} />
            </Td>
            <Td>
              <Link to={String(p.id)} className="font-medium">
                {p.name}
              </Link>
              <span className="block text-xs text-sable-600">
                {[p.maker, p.range].filter(Boolean).join(' · ') || 'No maker given'}
                <span className="md:hidden"> · {paintTypeLabels[p.type]}</span>
              </span>
            </Td>
            <Td className="hidden md:table-cell">{paintTypeLabels[p.type]}</Td>
            <Td className="hidden lg:table-cell">{p.finish ? finishLabels[p.finish] : <span className="text-sable-600">—</span>}</Td>
            <Td className="hidden font-mono text-xs sm:table-cell">{p.hex ?? <span className="text-sable-600">—</span>}</Td>
            <Td className="text-right">
              <span className="inline-flex items-center justify-end gap-2">
                <StockBadge paint={p} />
                <span className="figures">{p.stock}</span>
              </span>
              {p.lowStockThreshold !== null && <span className="block text-xs text-sable-600 figures">low below {p.lowStockThreshold}</span>}
            </Td>
            <Td className="hidden text-right figures lg:table-cell">{p.recipeCount || <span className="text-sable-600">—</span>}</Td>
          </Tr>
        ))}
      </TBody>
    </Table>
  );
}
