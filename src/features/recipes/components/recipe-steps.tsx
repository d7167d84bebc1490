import { formatDilution, techniqueLabels, type Recipe, type RecipeStep } from '../../../../shared/schemas/recipes';
import type { Hazard } from '../../../../shared/schemas/commissions';
import { Swatch } from '../../../components/ui/swatch';
import { SafetyCaution } from './safety-caution';

const paintLabel = (p: { name: string; maker: string | null; hex: string | null }) => `${p.name}${p.maker ? ` (${p.maker})` : ''}${p.hex ? `, ${p.hex}` : ''}`;

export function formatPsi(psi: number, bar: number | null) {
  return `${psi} psi (${(bar ?? 0).toFixed(2)} bar)`;
}

function StepMixView({ step }: { step: RecipeStep }) {
  const mix = step.mix;
  if (!mix) return <p className="text-sm text-sable-600">No paint from the rack.</p>;
  if (mix.kind === 'ladder') {
    return (
      <div className="flex flex-col gap-2">
        <p className="text-sm">
          Ladder in {mix.steps} {mix.steps === 1 ? 'step' : 'steps'} from <strong className="font-medium">{mix.from.name}</strong> to <strong className="font-medium">{mix.to.name}</strong>
        </p>
        <ol className="flex flex-wrap items-end gap-2" aria-label="Ladder mixes, approximate colours">
          <li className="flex flex-col items-center gap-1 text-xs">
            <Swatch hex={mix.from.hex} label={paintLabel(mix.from)} />
            <span>{mix.from.name}</span>
          </li>
          {mix.rungs.map((r) => (
            <li key={r.ratio} className="flex flex-col items-center gap-1 text-xs">
              <Swatch hex={r.hex} label={`Mix ${r.ratio}, approximately ${r.hex}`} />
              <span className="figures">{r.ratio}</span>
            </li>
          ))}
          <li className="flex flex-col items-center gap-1 text-xs">
            <Swatch hex={mix.to.hex} label={paintLabel(mix.to)} />
            <span>{mix.to.name}</span>
          </li>
        </ol>
        <p className="text-xs text-sable-600">Mix colours are approximate: real paint mixes darker and duller than light does.</p>
      </div>
    );
  }
  return (
    <div className="flex flex-wrap items-center gap-3">
      <ul className="flex flex-col gap-1 text-sm">
        {mix.paints.map((p) => (
          <li key={p.paint.id} className="flex items-center gap-2">
            <Swatch size="sm" hex={p.paint.hex} label={paintLabel(p.paint)} />
            <span>
              {mix.paints.length > 1 && <span className="figures font-medium">{p.parts} × </span>}
              {p.paint.name}
              {p.paint.maker && <span className="text-sable-600"> · {p.paint.maker}</span>}
            </span>
          </li>
        ))}
      </ul>
      {mix.paints.length > 1 && mix.previewHex && (
        <span className="flex items-center gap-2 text-xs text-sable-600">
          <Swatch hex={mix.previewHex} label={`Mix ${mix.ratio}, approximately ${mix.previewHex}`} />
          <span>
            Mix <span className="figures">{mix.ratio}</span>, approximate
          </span>
        </span>
      )}
    </div>
  );
}

/** A recipe's steps in order, as the painter reads them at the bench. */
export function RecipeSteps({ recipe, hazards }: { recipe: Recipe; hazards: Hazard[] | undefined }) {
  if (recipe.steps.length === 0) return <p className="text-sm text-sable-600">No steps yet.</p>;
  return (
    <ol className="flex flex-col gap-4">
      {recipe.steps.map((s, i) => (
        <li key={s.id} className="rounded-card border border-primer-300 bg-white p-4">
          <div className="mb-2 flex flex-wrap items-baseline gap-x-3 gap-y-1">
            <h3 className="text-base font-semibold">
              <span className="figures text-sable-600">{i + 1}.</span> {techniqueLabels[s.technique]}
            </h3>
            {s.dilution && <span className="text-sm">Thinned {formatDilution(s.dilution)}</span>}
            {s.airbrush && (s.technique !== 'airbrush' || s.psi !== null) && (
              <span className="text-sm">
                {s.technique === 'airbrush' ? 'At' : 'With an airbrush'}
                {s.psi !== null && (
                  <>
                    {s.technique === 'airbrush' ? ' ' : ' at '}
                    <span className="figures">{formatPsi(s.psi, s.bar)}</span>
                  </>
                )}
              </span>
            )}
            {s.tool && <span className="text-sm text-sable-600">Tool: {s.tool}</span>}
          </div>
          <StepMixView step={s} />
          {s.notes && <p className="mt-2 text-sm whitespace-pre-line">{s.notes}</p>}
          <SafetyCaution className="mt-3" keys={s.hazards} texts={hazards} />
        </li>
      ))}
    </ol>
  );
}
