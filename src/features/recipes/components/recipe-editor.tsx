import { useMemo, useState } from 'react';
import { Controller, useFieldArray, useForm, useWatch, type Control, type UseFormRegister } from 'react-hook-form';
import { ArrowDown, ArrowUp, Plus, Trash2 } from 'lucide-react';
import { isHex, ladder, mixPreview, psiToBar } from '../../../../shared/color';
import type { Hazard } from '../../../../shared/schemas/commissions';
import { paintTypeLabels, paintTypes, type Paint } from '../../../../shared/schemas/paints';
import {
  diluentLabels,
  diluents,
  MAX_LADDER_STEPS,
  MAX_MIX_PAINTS,
  recipeInput,
  recipeTechniques,
  stepHazards,
  techniqueLabels,
  type Diluent,
  type Recipe,
  type RecipeTechnique,
} from '../../../../shared/schemas/recipes';
import { ColourField } from '../../../components/form/colour-field';
import { Button } from '../../../components/ui/button';
import { ErrorNote } from '../../../components/ui/error-note';
import { SelectField, TextArea, TextField } from '../../../components/ui/field';
import { Swatch } from '../../../components/ui/swatch';
import { isApiError } from '../../../lib/api-client';
import type { RecipeBody } from '../api/save-recipe';
import { SafetyCaution } from './safety-caution';

type PaintRow = { paintId: string; parts: string };
type StepValues = {
  technique: RecipeTechnique;
  airbrush: boolean;
  psi: string;
  thinned: boolean;
  diluent: string;
  paintParts: string;
  with: Diluent;
  paints: PaintRow[];
  ladder: boolean;
  ladderSteps: string;
  tool: string;
  notes: string;
};
type RecipeValues = { name: string; description: string; colour: string; steps: StepValues[] };
type Errors = Record<string, string>;

const newStep = (technique: RecipeTechnique = 'basecoat', paintId = ''): StepValues => ({
  technique,
  airbrush: technique === 'airbrush',
  psi: '',
  thinned: false,
  diluent: '1',
  paintParts: '1',
  with: 'water',
  paints: [{ paintId, parts: '1' }],
  ladder: false,
  ladderSteps: '3',
  tool: '',
  notes: '',
});

function valuesFrom(recipe?: Recipe, start?: { colour?: string; paintId?: number }): RecipeValues {
  if (!recipe) {
    return { name: '', description: '', colour: start?.colour ?? '', steps: [newStep('basecoat', start?.paintId ? String(start.paintId) : '')] };
  }
  return {
    name: recipe.name,
    description: recipe.description ?? '',
    colour: recipe.colour ?? '',
    steps: recipe.steps.map((s) => ({
      technique: s.technique,
      airbrush: s.airbrush,
      psi: s.psi === null ? '' : String(s.psi),
      thinned: s.dilution !== null,
      diluent: String(s.dilution?.diluent ?? 1),
      paintParts: String(s.dilution?.paint ?? 1),
      with: s.dilution?.with ?? 'water',
      paints: !s.mix
        ? []
        : s.mix.kind === 'ladder'
          ? [
              { paintId: String(s.mix.from.id), parts: '1' },
              { paintId: String(s.mix.to.id), parts: '1' },
            ]
          : s.mix.paints.map((p) => ({ paintId: String(p.paint.id), parts: String(p.parts) })),
      ladder: s.mix?.kind === 'ladder',
      ladderSteps: String(s.mix?.kind === 'ladder' ? s.mix.steps : 3),
      tool: s.tool ?? '',
      notes: s.notes ?? '',
    })),
  };
}

const num = (v: string) => (v.trim() === '' ? Number.NaN : Number(v));

function toBody(v: RecipeValues, sourcePhotoId: number | null | undefined): RecipeBody {
  return {
    name: v.name,
    description: v.description,
    colour: v.colour.trim(),
    ...(sourcePhotoId !== undefined ? { sourcePhotoId } : {}),
    steps: v.steps.map((s) => {
      const airbrush = s.airbrush || s.technique === 'airbrush';
      return {
        technique: s.technique,
        airbrush,
        psi: airbrush && s.psi.trim() !== '' ? num(s.psi) : null,
        dilution: s.thinned ? { diluent: num(s.diluent), paint: num(s.paintParts), with: s.with } : null,
        paints: s.paints.map((p) => ({ paintId: Number(p.paintId) || 0, parts: s.ladder ? 1 : num(p.parts) })),
        ladderSteps: s.ladder ? num(s.ladderSteps) : null,
        tool: s.tool,
        notes: s.notes,
      };
    }),
  };
}

/** Messages by the form's own paths: the API's `steps.0.dilution.diluent` is the form's `steps.0.diluent`. */
function toFormPaths(fields: Record<string, string>): Errors {
  const out: Errors = {};
  for (const [k, m] of Object.entries(fields)) {
    const key = k.replace(/\.dilution\.diluent$/, '.diluent').replace(/\.dilution\.paint$/, '.paintParts').replace(/\.dilution\.with$/, '.with');
    out[key] ??= m;
  }
  return out;
}

function zodFieldErrors(issues: { path: PropertyKey[]; message: string }[]): Errors {
  const out: Errors = {};
  for (const i of issues) out[i.path.map(String).join('.') || '_'] ??= i.message;
  return out;
}

/**
 * Writes a recipe: its name and target colour, then ordered steps, each with a technique, paints in
 * parts or a ladder from one paint to the next, a dilution, airbrush pressure, tool and notes.
 * Mix previews are approximate; the safety caution follows the step as it is edited.
 */
export function RecipeEditor({
  recipe,
  start,
  paints,
  hazards,
  submitLabel,
  pending,
  onSave,
  onCancel,
}: {
  recipe?: Recipe;
  start?: { colour?: string; paintId?: number; sourcePhotoId?: number };
  paints: Paint[];
  hazards: Hazard[] | undefined;
  submitLabel: string;
  pending: boolean;
  onSave: (body: RecipeBody) => Promise<unknown>;
  onCancel?: () => void;
}) {
  const { register, control, handleSubmit } = useForm<RecipeValues>({ defaultValues: valuesFrom(recipe, start) });
  const steps = useFieldArray({ control, name: 'steps' });
  const [errors, setErrors] = useState<Errors>({});
  const [formError, setFormError] = useState<string | null>(null);
  const byId = useMemo(() => new Map(paints.map((p) => [String(p.id), p])), [paints]);

  const onSubmit = handleSubmit(async (values) => {
    setFormError(null);
    const body = toBody(values, recipe ? undefined : (start?.sourcePhotoId ?? null));
    const parsed = recipeInput.safeParse(body);
    if (!parsed.success) {
      setErrors(toFormPaths(zodFieldErrors(parsed.error.issues)));
      setFormError('Some fields need a look; each says what is wrong.');
      return;
    }
    setErrors({});
    try {
      await onSave(body);
    } catch (err) {
      if (isApiError(err) && Object.keys(err.fields).length) {
        setErrors(toFormPaths(err.fields));
        setFormError('Some fields need a look; each says what is wrong.');
      } else setFormError(isApiError(err) ? err.message : 'That did not save. Try again.');
    }
  });

  return (
    <form onSubmit={onSubmit} noValidate className="flex flex-col gap-6">
      {formError && <ErrorNote>{formError}</ErrorNote>}
      <div className="grid gap-4 sm:grid-cols-2">
        <TextField label="Recipe name" placeholder="e.g. washed denim" autoComplete="off" error={errors.name} {...register('name')} />
        <Controller
          control={control}
          name="colour"
          render={({ field }) => (
            <ColourField
              label="Target colour"
              optional
              hint="What you are aiming for, e.g. picked from a reference photo. The shopping list flags it when no paint on the rack is close."
              value={field.value}
              onChange={field.onChange}
              onBlur={field.onBlur}
              error={errors.colour}
            />
          )}
        />
        <TextArea label="What it is for" optional rows={2} className="sm:col-span-2" error={errors.description} {...register('description')} />
      </div>

      <fieldset className="flex flex-col gap-4">
        <legend className="mb-2 text-base font-semibold">Steps, in order</legend>
        {steps.fields.length === 0 && <p className="text-sm text-sable-600">No steps yet. Add the first below.</p>}
        <ol className="flex flex-col gap-4">
          {steps.fields.map((f, i) => (
            <StepEditor
              key={f.id}
              index={i}
              count={steps.fields.length}
              control={control}
              register={register}
              paints={paints}
              byId={byId}
              hazards={hazards}
              errors={errors}
              onMove={(to) => steps.move(i, to)}
              onRemove={() => steps.remove(i)}
            />
          ))}
        </ol>
        <div>
          <Button variant="secondary" onClick={() => steps.append(newStep(steps.fields.length ? 'layer' : 'basecoat'))} disabled={steps.fields.length >= 30}>
            <Plus aria-hidden="true" className="size-4" />
            Add a step
          </Button>
        </div>
      </fieldset>

      <div className="flex flex-wrap gap-2">
        <Button type="submit" loading={pending}>
          {submitLabel}
        </Button>
        {onCancel && (
          <Button variant="secondary" onClick={onCancel}>
            Cancel
          </Button>
        )}
      </div>
    </form>
  );
}

function PaintOptions({ paints }: { paints: Paint[] }) {
  return (
    <>
      <option value="">Choose a paint…</option>
      {paintTypes.map((t) => {
        const list = paints.filter((p) => p.type === t);
        if (!list.length) return null;
        return (
          <optgroup key={t} label={paintTypeLabels[t]}>
            {list.map((p) => (
              <option key={p.id} value={p.id}>
                {p.name}
                {p.maker ? ` · ${p.maker}` : ''}
                {p.stockState === 'out' ? ' (out of stock)' : p.stockState === 'low' ? ' (low)' : ''}
              </option>
            ))}
          </optgroup>
        );
      })}
    </>
  );
}

function StepEditor({
  index,
  count,
  control,
  register,
  paints,
  byId,
  hazards,
  errors,
  onMove,
  onRemove,
}: {
  index: number;
  count: number;
  control: Control<RecipeValues>;
  register: UseFormRegister<RecipeValues>;
  paints: Paint[];
  byId: Map<string, Paint>;
  hazards: Hazard[] | undefined;
  errors: Errors;
  onMove: (to: number) => void;
  onRemove: () => void;
}) {
  const p = `steps.${index}` as const;
  /** Visible labels stay short; screen readers also hear which step a control belongs to. */
  const inStep = (text: string) => (
    <>
      {text}
      <span className="sr-only"> (step {index + 1})</span>
    </>
  );
  const mixPaints = useFieldArray({ control, name: `${p}.paints` });
  const step = useWatch({ control, name: p });
  const err = (k: string) => errors[`${p}.${k}`];
  const technique = step.technique;
  const airbrush = step.airbrush || technique === 'airbrush';
  const chosen = step.paints.map((r) => byId.get(r.paintId));
  const stepHaz = stepHazards({ technique, airbrush, dilution: step.thinned ? { with: step.with } : null }, chosen.flatMap((x) => (x ? [x.type] : [])));
  const psi = Number(step.psi);
  const preview = previewOf(step, chosen);

  return (
    <li className="rounded-card border border-primer-300 bg-white p-4">
      <div className="mb-3 flex flex-wrap items-end justify-between gap-3">
        <SelectField label={`Step ${index + 1}: technique`} className="min-w-48" error={err('technique')} {...register(`${p}.technique`)}>
          {recipeTechniques.map((t) => (
            <option key={t} value={t}>
              {techniqueLabels[t]}
            </option>
          ))}
        </SelectField>
        <div className="flex gap-1">
          <Button variant="ghost" size="sm" aria-label={`Move step ${index + 1} up`} disabled={index === 0} onClick={() => onMove(index - 1)}>
            <ArrowUp aria-hidden="true" className="size-4" />
          </Button>
          <Button variant="ghost" size="sm" aria-label={`Move step ${index + 1} down`} disabled={index === count - 1} onClick={() => onMove(index + 1)}>
            <ArrowDown aria-hidden="true" className="size-4" />
          </Button>
          <Button variant="ghost" size="sm" onClick={onRemove}>
            <Trash2 aria-hidden="true" className="size-4" />
            Remove step
          </Button>
        </div>
      </div>

      <fieldset className="mb-3 flex flex-col gap-2">
        <legend className="mb-1 text-sm font-medium">Paints</legend>
        <label className="flex items-center gap-2 text-sm">
          <input type="checkbox" className="size-4 accent-verdigris-600" {...register(`${p}.ladder`)} />
          {inStep('Ladder of progressive mixes from the first paint to the second')}
        </label>
        {mixPaints.fields.map((f, j) => {
          const chosenPaint = chosen[j];
          return (
            <div key={f.id} className="flex flex-wrap items-end gap-2">
              <Swatch className="mb-1.5" hex={chosenPaint?.hex ?? null} label={chosenPaint ? `${chosenPaint.name}${chosenPaint.hex ? `, ${chosenPaint.hex}` : ''}` : 'No paint chosen'} />
              <SelectField
                label={inStep(step.ladder ? (j === 0 ? 'From paint' : j === 1 ? 'To paint' : `Paint ${j + 1}`) : `Paint ${j + 1}`)}
                className="min-w-56 flex-1"
                error={err(`paints.${j}.paintId`)}
                {...register(`${p}.paints.${j}.paintId`)}
              >
                <PaintOptions paints={paints} />
              </SelectField>
              {!step.ladder && (
                <TextField
                  label={inStep(`Parts of paint ${j + 1}`)}
                  type="number"
                  inputMode="decimal"
                  min={0.5}
                  step={0.5}
                  className="figures w-24"
                  error={err(`paints.${j}.parts`)}
                  {...register(`${p}.paints.${j}.parts`)}
                />
              )}
              <Button variant="ghost" size="sm" className="mb-1" aria-label={`Remove paint ${j + 1} of step ${index + 1}`} onClick={() => mixPaints.remove(j)}>
                <Trash2 aria-hidden="true" className="size-4" />
              </Button>
            </div>
          );
        })}
        {err('paints') && <p className="text-sm text-oxide-600">{err('paints')}</p>}
        <div className="flex flex-wrap items-end gap-3">
          <Button variant="secondary" size="sm" disabled={mixPaints.fields.length >= MAX_MIX_PAINTS} onClick={() => mixPaints.append({ paintId: '', parts: '1' })}>
            <Plus aria-hidden="true" className="size-4" />
            Add a paint
          </Button>
          {step.ladder && (
            <TextField label={inStep('Steps in the ladder')} type="number" inputMode="numeric" min={1} max={MAX_LADDER_STEPS} className="figures w-40" error={err('ladderSteps')} {...register(`${p}.ladderSteps`)} />
          )}
        </div>
        {preview && (
          <div className="flex flex-wrap items-center gap-2 text-xs text-sable-600" aria-label="Preview of the mix, approximate">
            {preview.map((c) => (
              <span key={c.label} className="flex items-center gap-1">
                <Swatch size="sm" hex={c.hex} label={`${c.label}, approximately ${c.hex}`} />
                <span className="figures">{c.label}</span>
              </span>
            ))}
            <span>· approximate colours</span>
          </div>
        )}
      </fieldset>

      <div className="mb-3 grid gap-3 sm:grid-cols-2">
        <fieldset className="flex flex-col gap-2">
          <legend className="sr-only">Dilution</legend>
          <label className="flex items-center gap-2 text-sm">
            <input type="checkbox" className="size-4 accent-verdigris-600" {...register(`${p}.thinned`)} />
            {inStep('Thinned')}
          </label>
          {step.thinned && (
            <>
              <div className="flex flex-wrap items-end gap-2">
                <TextField label={inStep(`Parts ${diluentLabels[step.with] ?? 'water'}`)} type="number" inputMode="numeric" min={0} className="figures w-28" error={err('diluent')} {...register(`${p}.diluent`)} />
                <span className="pb-2 text-lg" aria-hidden="true">
                  :
                </span>
                <TextField label={inStep('Parts paint')} type="number" inputMode="numeric" min={1} className="figures w-28" error={err('paintParts')} {...register(`${p}.paintParts`)} />
                <SelectField label={inStep('Thinned with')} className="w-44" error={err('with')} {...register(`${p}.with`)}>
                  {diluents.map((d) => (
                    <option key={d} value={d}>
                      {diluentLabels[d]}
                    </option>
                  ))}
                </SelectField>
              </div>
              <p className="text-xs text-sable-600">A glaze is commonly about 5–6 parts water to 1 part paint (common practice).</p>
            </>
          )}
        </fieldset>
        <fieldset className="flex flex-col gap-2">
          <legend className="sr-only">Airbrush</legend>
          <label className="flex items-center gap-2 text-sm">
            {technique === 'airbrush' ? (
              <input type="checkbox" className="size-4 accent-verdigris-600" checked disabled readOnly />
            ) : (
              <input type="checkbox" className="size-4 accent-verdigris-600" {...register(`${p}.airbrush`)} />
            )}
            {inStep('Applied with an airbrush')}
          </label>
          {airbrush && (
            <div className="flex flex-wrap items-end gap-2">
              <TextField label={inStep('Air pressure (psi)')} type="number" inputMode="decimal" min={1} max={60} step={0.5} optional className="figures w-40" error={err('psi')} {...register(`${p}.psi`)} />
              {Number.isFinite(psi) && psi > 0 && (
                <span className="pb-2 text-sm figures" aria-live="polite">
                  = {psiToBar(psi).toFixed(2)} bar
                </span>
              )}
              <p className="basis-full text-xs text-sable-600">Glazing with an airbrush is commonly about 10–15 psi (common practice).</p>
            </div>
          )}
        </fieldset>
      </div>

      <div className="grid gap-3 sm:grid-cols-2">
        <TextField label={inStep('Tool')} optional placeholder="e.g. size 1 round" autoComplete="off" error={err('tool')} {...register(`${p}.tool`)} />
        <TextArea label={inStep('Notes')} optional rows={2} error={err('notes')} {...register(`${p}.notes`)} />
      </div>
      <SafetyCaution className="mt-3" keys={stepHaz} texts={hazards} />
    </li>
  );
}

/** The approximate colours of the step as typed so far: the mix, or each rung of the ladder. */
function previewOf(step: StepValues, chosen: (Paint | undefined)[]): { label: string; hex: string }[] | null {
  const coloured = chosen.map((c, i) => ({ c, parts: Number(step.paints[i]?.parts) })).filter((x) => x.c?.hex && isHex(x.c.hex));
  if (step.ladder) {
    const [a, b] = chosen;
    const n = Number(step.ladderSteps);
    if (!a?.hex || !b?.hex || !Number.isInteger(n) || n < 1 || n > MAX_LADDER_STEPS) return null;
    return ladder(a.hex, b.hex, n).map((r) => ({ label: r.ratio, hex: r.hex }));
  }
  const valid = coloured.filter((x) => Number.isFinite(x.parts) && x.parts > 0);
  if (valid.length < 2) return null;
  return [{ label: valid.map((x) => x.parts).join(':'), hex: mixPreview(valid.map((x) => ({ hex: x.c!.hex!, parts: x.parts }))) }];
}
