import { Link } from 'react-router-dom';
import { TriangleAlert } from 'lucide-react';
import { techniqueLabels, type RecipeSummary } from '../../../../shared/schemas/recipes';
import { Swatch } from '../../../components/ui/swatch';
import { Table, TBody, Td, Th, THead, Tr } from '../../../components/ui/table';

export function SwatchStrip({ swatches, label }: { swatches: string[]; label: string }) {
  if (!swatches.length) return <span className="text-sable-600">—</span>;
  return (
    <span role="img" aria-label={`${label}: ${swatches.join(', ')}, approximate`} className="inline-flex overflow-hidden rounded-control border border-sable-600/40">
      {swatches.slice(0, 10).map((hex, i) => (
        <span key={`${hex}-${i}`} className="h-5 w-4" style={{ backgroundColor: hex }} />
      ))}
    </span>
  );
}

export function RecipesTable({ recipes, caption }: { recipes: RecipeSummary[]; caption: string }) {
  return (
    <Table caption={caption}>
      <THead>
        <Tr>
          <Th className="w-12">
            <span className="sr-only">Colour</span>
          </Th>
          <Th>Recipe</Th>
          <Th className="hidden md:table-cell">Steps</Th>
          <Th className="hidden sm:table-cell">Colours</Th>
          <Th className="hidden lg:table-cell text-right">In schemes</Th>
        </Tr>
      </THead>
      <TBody>
        {recipes.map((r) => (
          <Tr key={r.id} className="hover:bg-verdigris-100">
            <Td>
              <Swatch hex={r.swatch} label={r.swatch ? `${r.name}, ${r.swatch}` : `${r.name}, no colour yet`} />
            </Td>
            <Td>
              <Link to={String(r.id)} className="font-medium">
                {r.name}
              </Link>
              {r.hazards.length > 0 && (
                <span className="ml-2 inline-flex items-center gap-1 text-xs text-sable-600">
                  <TriangleAlert aria-hidden="true" className="size-3.5" />
                  Safety note
                </span>
              )}
              <span className="block text-xs text-sable-600 md:hidden">
                {r.stepCount} {r.stepCount === 1 ? 'step' : 'steps'}
              </span>
            </Td>
            <Td className="hidden text-sm md:table-cell">
              <span className="figures">{r.stepCount}</span>
              {r.techniques.length > 0 && <span className="text-sable-600"> · {r.techniques.map((t) => techniqueLabels[t]).join(', ')}</span>}
            </Td>
            <Td className="hidden sm:table-cell">
              <SwatchStrip swatches={r.swatches} label={`Colours of ${r.name}`} />
            </Td>
            <Td className="hidden text-right figures lg:table-cell">{r.schemeCount || <span className="text-sable-600">—</span>}</Td>
          </Tr>
        ))}
      </TBody>
    </Table>
  );
}
