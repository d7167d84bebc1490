import type { FieldErrors, UseFormRegister } from 'react-hook-form';
import { sizeClasses, sizeClassLabels, type FigureInput, type StudioLists } from '../../../../shared/schemas/commissions';
import { SelectField, TextField } from '../../../components/ui/field';

export type PersonOption = { id: number; name: string };

/** Form rows hold figures as the schema's input; sub-assemblies are typed as one comma-separated line. */
export type FiguresForm = { figures: FigureInput[] };

export const emptyFigure = (tier = 'tabletop'): FigureInput => ({
  name: '',
  quantity: 1,
  sizeClass: '28',
  footprint: '',
  tier,
  extras: [],
  subAssemblies: [],
  lightSource: '',
  painterId: null,
});

const toList = (v: unknown) =>
  Array.isArray(v)
    ? v
    : String(v ?? '')
        .split(',')
        .map((s) => s.trim())
        .filter(Boolean);

/** One figure's fields; `index` is its row in `figures`. */
export function FigureFields({
  index,
  register,
  large,
  errors,
  lists,
  painters,
}: {
  index: number;
  register: UseFormRegister<FiguresForm>;
  /** the row's base size is "large" (then it needs a footprint) */
  large: boolean;
  errors: FieldErrors<FiguresForm>;
  lists: StudioLists | undefined;
  painters: PersonOption[];
}) {
  const e = errors.figures?.[index];
  const n = index + 1;
  return (
    <div className="grid gap-4 sm:grid-cols-6">
      <TextField label={`Figure ${n}: name`} className="sm:col-span-4" autoComplete="off" error={e?.name?.message} {...register(`figures.${index}.name`)} />
      <TextField
        label="How many"
        type="number"
        min={1}
        max={500}
        inputMode="numeric"
        className="sm:col-span-2"
        hint="Identical figures are painted as one batch."
        error={e?.quantity?.message}
        {...register(`figures.${index}.quantity`, { valueAsNumber: true })}
      />
      <SelectField label="Base size" className="sm:col-span-2" error={e?.sizeClass?.message} {...register(`figures.${index}.sizeClass`)}>
        {sizeClasses.map((s) => (
          <option key={s} value={s}>
            {sizeClassLabels[s]}
          </option>
        ))}
      </SelectField>
      {large && (
        <TextField
          label="Footprint"
          className="sm:col-span-2"
          placeholder="e.g. 180 × 110 mm"
          error={e?.footprint?.message}
          {...register(`figures.${index}.footprint`)}
        />
      )}
      <SelectField label="Tier" className="sm:col-span-2" error={e?.tier?.message} {...register(`figures.${index}.tier`)}>
        {(lists?.tiers ?? [{ key: 'tabletop', label: 'Tabletop' }]).map((t) => (
          <option key={t.key} value={t.key}>
            {t.label}
          </option>
        ))}
      </SelectField>
      <SelectField
        label="Painter"
        optional
        className="sm:col-span-2"
        error={e?.painterId?.message}
        {...register(`figures.${index}.painterId`, { setValueAs: (v) => (v === '' || v === null || v === undefined ? null : Number(v)) })}
      >
        <option value="">Not assigned yet</option>
        {painters.map((p) => (
          <option key={p.id} value={p.id}>
            {p.name}
          </option>
        ))}
      </SelectField>
      {lists && lists.extras.length > 0 && (
        <fieldset className="sm:col-span-6">
          <legend className="mb-1 text-sm font-medium">
            Extras <span className="font-normal text-sable-600">(optional)</span>
          </legend>
          <div className="flex flex-wrap gap-x-4 gap-y-1">
            {lists.extras.map((x) => (
              <label key={x.key} className="inline-flex min-h-8 items-center gap-2 text-sm">
                <input type="checkbox" value={x.key} className="size-4 accent-verdigris-600" {...register(`figures.${index}.extras`)} />
                {x.label}
              </label>
            ))}
          </div>
        </fieldset>
      )}
      <TextField
        label="Parts painted separately"
        optional
        className="sm:col-span-3"
        placeholder="rider, mount, base"
        hint="Separate them with commas."
        error={e?.subAssemblies?.message ?? e?.subAssemblies?.[0]?.message}
        {...register(`figures.${index}.subAssemblies`, { setValueAs: toList })}
      />
      <TextField
        label="Light source"
        optional
        className="sm:col-span-3"
        placeholder="e.g. from the upper left"
        hint="Where the light comes from, so separate parts match."
        error={e?.lightSource?.message}
        {...register(`figures.${index}.lightSource`)}
      />
    </div>
  );
}
