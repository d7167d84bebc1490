import { useFieldArray, useWatch, type Control, type FieldErrors, type UseFormRegister } from 'react-hook-form';
import { Plus, Trash2 } from 'lucide-react';
import { Button } from '../../../components/ui/button';
import { SelectField, TextField } from '../../../components/ui/field';
import { emptyExtra, type PriceDraft } from './draft';
import { errorAt, InlineError } from './form-bits';

type Common = { register: UseFormRegister<PriceDraft>; control: Control<PriceDraft>; errors: FieldErrors<PriceDraft>; currency: string };

function ListError({ errors, path }: { errors: FieldErrors<PriceDraft>; path: string }) {
  const message = errorAt(errors, `${path}.root`) ?? errorAt(errors, path);
  return message ? <InlineError>{message}</InlineError> : null;
}

function ExtraRow({ index, register, control, errors, currency, stages, onRemove }: Common & { index: number; stages: PriceDraft['stages']; onRemove: () => void }) {
  const kind = useWatch({ control, name: `extras.${index}.kind` });
  const label = useWatch({ control, name: `extras.${index}.label` });
  const p = `extras.${index}` as const;
  return (
    <li className="grid grid-cols-2 gap-3 border-b border-primer-300 pb-4 last:border-b-0 sm:grid-cols-12 sm:items-start">
      <TextField label="Extra" className="col-span-2 sm:col-span-4" autoComplete="off" error={errorAt(errors, `${p}.label`)} {...register(`${p}.label`)} />
      <SelectField label="Priced as" className="sm:col-span-3" {...register(`${p}.kind`)}>
        <option value="hours">Added hours</option>
        <option value="flat">Flat price</option>
      </SelectField>
      {kind === 'flat' ? (
        <TextField
          label={`Price per figure (${currency})`}
          className="figures sm:col-span-4"
          inputMode="decimal"
          autoComplete="off"
          error={errorAt(errors, `${p}.amount`)}
          {...register(`${p}.amount`)}
        />
      ) : (
        <>
          <TextField
            label="Hours per figure"
            className="figures sm:col-span-2"
            inputMode="decimal"
            autoComplete="off"
            error={errorAt(errors, `${p}.hours`)}
            {...register(`${p}.hours`)}
          />
          <SelectField label="Worked in stage" className="sm:col-span-2" error={errorAt(errors, `${p}.stage`)} {...register(`${p}.stage`)}>
            {stages.map((s) => (
              <option key={s.key} value={s.key}>
                {s.label}
              </option>
            ))}
          </SelectField>
        </>
      )}
      <div className={kind === 'flat' ? 'col-span-2 sm:col-span-1 sm:pt-6' : 'pt-6 sm:col-span-1'}>
        <Button variant="ghost" size="sm" onClick={onRemove} aria-label={`Remove ${label || 'this extra'}`}>
          <Trash2 aria-hidden="true" className="size-4" />
          <span className="sm:hidden">Remove</span>
        </Button>
      </div>
    </li>
  );
}

export function ExtrasEditor(props: Common & { stages: PriceDraft['stages'] }) {
  const { fields, append, remove } = useFieldArray({ control: props.control, name: 'extras', keyName: 'fieldId' });
  return (
    <div className="flex flex-col gap-4">
      {fields.length === 0 ? (
        <p className="text-sm text-sable-600">No extras yet.</p>
      ) : (
        <ul className="flex flex-col gap-4">
          {fields.map((f, i) => (
            <ExtraRow key={f.fieldId} index={i} {...props} onRemove={() => remove(i)} />
          ))}
        </ul>
      )}
      <ListError errors={props.errors} path="extras" />
      <div>
        <Button variant="secondary" size="sm" onClick={() => append(emptyExtra(props.stages[0]?.key ?? ''), { shouldFocus: true })}>
          <Plus aria-hidden="true" className="size-4" />
          Add an extra
        </Button>
      </div>
    </div>
  );
}

export function DiscountsEditor({ register, control, errors, currency }: Common) {
  const { fields, append, remove } = useFieldArray({ control, name: 'discounts', keyName: 'fieldId' });
  return (
    <div className="flex flex-col gap-4">
      {fields.length === 0 ? (
        <p className="text-sm text-sable-600">No discounts: every order pays the full price.</p>
      ) : (
        <ul className="flex flex-col gap-3">
          {fields.map((f, i) => (
            <li key={f.fieldId} className="grid grid-cols-[1fr_1fr_auto] items-start gap-3">
              <TextField
                label={`From an order of (${currency})`}
                className="figures"
                inputMode="decimal"
                autoComplete="off"
                error={errorAt(errors, `discounts.${i}.minTotal`)}
                {...register(`discounts.${i}.minTotal`)}
              />
              <TextField
                label="Discount (%)"
                className="figures"
                inputMode="decimal"
                autoComplete="off"
                error={errorAt(errors, `discounts.${i}.bp`)}
                {...register(`discounts.${i}.bp`)}
              />
              <div className="pt-6">
                <Button variant="ghost" size="sm" onClick={() => remove(i)} aria-label={`Remove discount ${i + 1}`}>
                  <Trash2 aria-hidden="true" className="size-4" />
                </Button>
              </div>
            </li>
          ))}
        </ul>
      )}
      <ListError errors={errors} path="discounts" />
      <div>
        <Button variant="secondary" size="sm" onClick={() => append({ minTotal: '', bp: '' }, { shouldFocus: true })}>
          <Plus aria-hidden="true" className="size-4" />
          Add a discount step
        </Button>
      </div>
    </div>
  );
}

const presetKinds: { value: PriceDraft['presetLines'][number]['kind']; label: string }[] = [
  { value: 'shipping', label: 'Shipping' },
  { value: 'insurance', label: 'Insurance' },
  { value: 'models', label: 'Models bought for the client' },
  { value: 'custom', label: 'Something else' },
];

export function PresetLinesEditor({ register, control, errors, currency }: Common) {
  const { fields, append, remove } = useFieldArray({ control, name: 'presetLines', keyName: 'fieldId' });
  return (
    <div className="flex flex-col gap-4">
      {fields.length === 0 ? (
        <p className="text-sm text-sable-600">No ready-made lines.</p>
      ) : (
        <ul className="flex flex-col gap-4">
          {fields.map((f, i) => (
            <li key={f.fieldId} className="grid grid-cols-2 gap-3 border-b border-primer-300 pb-4 last:border-b-0 sm:grid-cols-12 sm:items-start">
              <TextField label="Line" className="col-span-2 sm:col-span-4" autoComplete="off" error={errorAt(errors, `presetLines.${i}.label`)} {...register(`presetLines.${i}.label`)} />
              <SelectField label="Kind" className="col-span-2 sm:col-span-3" {...register(`presetLines.${i}.kind`)}>
                {presetKinds.map((k) => (
                  <option key={k.value} value={k.value}>
                    {k.label}
                  </option>
                ))}
              </SelectField>
              <TextField
                label={`Usual amount (${currency})`}
                className="figures sm:col-span-2"
                inputMode="decimal"
                autoComplete="off"
                error={errorAt(errors, `presetLines.${i}.amount`)}
                {...register(`presetLines.${i}.amount`)}
              />
              <label className="flex min-h-10 items-center gap-2 text-sm sm:col-span-2 sm:pt-6">
                <input type="checkbox" className="size-4 accent-verdigris-600" {...register(`presetLines.${i}.taxable`)} />
                Taxed
              </label>
              <div className="sm:col-span-1 sm:pt-6">
                <Button variant="ghost" size="sm" onClick={() => remove(i)} aria-label={`Remove line ${i + 1}`}>
                  <Trash2 aria-hidden="true" className="size-4" />
                  <span className="sm:hidden">Remove</span>
                </Button>
              </div>
            </li>
          ))}
        </ul>
      )}
      <ListError errors={errors} path="presetLines" />
      <div>
        <Button variant="secondary" size="sm" onClick={() => append({ key: '', label: '', kind: 'custom', amount: '0', taxable: true }, { shouldFocus: true })}>
          <Plus aria-hidden="true" className="size-4" />
          Add a line
        </Button>
      </div>
    </div>
  );
}
