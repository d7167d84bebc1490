import { useState } from 'react';
import { Controller, useForm, useWatch } from 'react-hook-form';
import type { z } from 'zod';
import { zodResolver } from '@hookform/resolvers/zod';
import { colourlessTypes, createPaintInput, finishes, finishLabels, paintTypeLabels, paintTypes, type Paint, type PaintType } from '../../../../shared/schemas/paints';
import { ColourField } from '../../../components/form/colour-field';
import { Button } from '../../../components/ui/button';
import { ErrorNote } from '../../../components/ui/error-note';
import { SelectField, TextArea, TextField } from '../../../components/ui/field';
import { applyServerErrors } from '../../../components/ui/form-errors';
import type { PaintBody } from '../api/save-paint';

const FIELDS = ['name', 'maker', 'range', 'type', 'finish', 'hex', 'stock', 'lowStockThreshold', 'notes'] as const;

const toNumber = (v: unknown) => (v === '' || v === null || v === undefined ? undefined : Number(v));
const toNullableNumber = (v: unknown) => (v === '' || v === null || v === undefined ? null : Number(v));

export function paintFormValues(p?: Paint, startHex?: string): PaintBody {
  return {
    name: p?.name ?? '',
    maker: p?.maker ?? '',
    range: p?.range ?? '',
    type: p?.type ?? 'layer',
    finish: p?.finish ?? '',
    hex: p?.hex ?? startHex ?? '',
    stock: p?.stock ?? 1,
    lowStockThreshold: p?.lowStockThreshold ?? null,
    notes: p?.notes ?? '',
  };
}

/** One form to add and to change a paint; empty text fields are sent as cleared. */
export function PaintForm({
  paint,
  startHex,
  submitLabel,
  pending,
  onSave,
  onCancel,
}: {
  paint?: Paint;
  startHex?: string;
  submitLabel: string;
  pending: boolean;
  onSave: (body: PaintBody) => Promise<unknown>;
  onCancel?: () => void;
}) {
  const [formError, setFormError] = useState<string | null>(null);
  const {
    register,
    control,
    handleSubmit,
    setError,
    formState: { errors },
  } = useForm<PaintBody, unknown, z.output<typeof createPaintInput>>({ resolver: zodResolver(createPaintInput), defaultValues: paintFormValues(paint, startHex) });

  const type = useWatch({ control, name: 'type' }) as PaintType;
  const colourOptional = colourlessTypes.includes(type);

  const onSubmit = handleSubmit(async (body) => {
    setFormError(null);
    try {
      await onSave(body);
    } catch (err) {
      setFormError(applyServerErrors(err, setError, FIELDS));
    }
  });

  return (
    <form onSubmit={onSubmit} noValidate className="flex flex-col gap-5">
      {formError && <ErrorNote>{formError}</ErrorNote>}
      <div className="grid gap-4 sm:grid-cols-2">
        <TextField label="Name on the rack" autoComplete="off" className="sm:col-span-2" hint="The studio's own name for it." error={errors.name?.message} {...register('name')} />
        <TextField label="Maker" optional autoComplete="off" error={errors.maker?.message} {...register('maker')} />
        <TextField label="Range" optional autoComplete="off" error={errors.range?.message} {...register('range')} />
        <SelectField label="Type" error={errors.type?.message} {...register('type')}>
          {paintTypes.map((t) => (
            <option key={t} value={t}>
              {paintTypeLabels[t]}
            </option>
          ))}
        </SelectField>
        <SelectField label="Finish" optional error={errors.finish?.message} {...register('finish')}>
          <option value="">Not given</option>
          {finishes.map((f) => (
            <option key={f} value={f}>
              {finishLabels[f]}
            </option>
          ))}
        </SelectField>
        <Controller
          control={control}
          name="hex"
          render={({ field }) => (
            <ColourField
              label="Colour"
              optional={colourOptional}
              className="sm:col-span-2"
              hint="Pick it, or type the hex code as #RRGGBB. Matches against reference photos use this colour."
              value={field.value ?? ''}
              onChange={field.onChange}
              onBlur={field.onBlur}
              name={field.name}
              error={errors.hex?.message}
            />
          )}
        />
        <TextField
          label="Pots in stock"
          type="number"
          inputMode="numeric"
          min={0}
          step={1}
          className="figures"
          error={errors.stock?.message}
          {...register('stock', { setValueAs: toNumber })}
        />
        <TextField
          label="Running low below"
          type="number"
          inputMode="numeric"
          min={0}
          step={1}
          optional
          hint="Pots. With 2, one pot left shows as low."
          error={errors.lowStockThreshold?.message}
          {...register('lowStockThreshold', { setValueAs: toNullableNumber })}
        />
      </div>
      <TextArea label="Notes" optional rows={3} error={errors.notes?.message} {...register('notes')} />
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
