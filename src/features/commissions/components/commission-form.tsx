import { useState } from 'react';
import { useFieldArray, useForm, useWatch } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { Plus, Trash2 } from 'lucide-react';
import { priorities, priorityLabels } from '../../../../shared/commission-lifecycle';
import { createCommissionInput, type CreateCommissionInput, type StudioLists } from '../../../../shared/schemas/commissions';
import { Button } from '../../../components/ui/button';
import { ErrorNote } from '../../../components/ui/error-note';
import { SelectField, TextArea, TextField } from '../../../components/ui/field';
import { applyServerErrors } from '../../../components/ui/form-errors';
import type { CreateCommissionBody } from '../api/create-commission';
import { emptyFigure, FigureFields, type FiguresForm, type PersonOption } from './figure-fields';

type FormValues = Omit<CreateCommissionInput, 'clientId'> & { clientId: number | undefined } & FiguresForm;

export function CommissionForm({
  clients,
  painters,
  lists,
  defaultClientId,
  pending,
  onSave,
  onCancel,
}: {
  clients: PersonOption[];
  painters: PersonOption[];
  lists: StudioLists | undefined;
  defaultClientId?: number;
  pending: boolean;
  onSave: (body: CreateCommissionBody) => Promise<unknown>;
  onCancel: () => void;
}) {
  const [formError, setFormError] = useState<string | null>(null);
  const firstTier = lists?.tiers[0]?.key ?? 'tabletop';
  const {
    register,
    handleSubmit,
    control,
    setError,
    setFocus,
    formState: { errors },
  } = useForm<FormValues>({
    // The schema's parse gives the body to send.
    resolver: zodResolver(createCommissionInput) as never,
    defaultValues: { clientId: defaultClientId, title: '', brief: '', dueDate: '', priority: 'normal', figures: [emptyFigure(firstTier)] },
  });
  const figures = useFieldArray({ control, name: 'figures' });
  const rows = useWatch({ control, name: 'figures' });

  const onSubmit = handleSubmit(async (values) => {
    setFormError(null);
    try {
      await onSave(values as CreateCommissionBody);
    } catch (err) {
      setFormError(applyServerErrors(err, setError));
    }
  });

  return (
    <form onSubmit={onSubmit} noValidate className="flex flex-col gap-6" aria-label="New commission">
      {formError && <ErrorNote>{formError}</ErrorNote>}
      <div className="grid gap-4 sm:grid-cols-2">
        <SelectField
          label="Client"
          error={errors.clientId?.message}
          hint={clients.length === 0 ? 'Add the client first, under Clients.' : undefined}
          {...register('clientId', { setValueAs: (v) => (v === '' || v === undefined ? undefined : Number(v)) })}
        >
          <option value="">Choose a client</option>
          {clients.map((c) => (
            <option key={c.id} value={c.id}>
              {c.name}
            </option>
          ))}
        </SelectField>
        <TextField label="Title" autoComplete="off" placeholder="e.g. Swamp warband, 20 figures" error={errors.title?.message} {...register('title')} />
        <TextArea
          label="Brief"
          optional
          rows={4}
          className="sm:col-span-2"
          hint="What the client asked for: colours, references, the feel they want."
          error={errors.brief?.message}
          {...register('brief')}
        />
        <TextField label="Due date" type="date" optional error={errors.dueDate?.message} {...register('dueDate')} />
        <SelectField label="Priority" error={errors.priority?.message} {...register('priority')}>
          {priorities.map((p) => (
            <option key={p} value={p}>
              {priorityLabels[p]}
            </option>
          ))}
        </SelectField>
      </div>

      <section aria-labelledby="figures-title" className="flex flex-col gap-4">
        <div>
          <h2 id="figures-title" className="text-lg font-semibold">
            Figures
          </h2>
          <p className="text-sm text-sable-600">Each figure gets the studio’s stage checklist, from prep to varnish.</p>
        </div>
        {figures.fields.map((f, i) => (
          <fieldset key={f.id} className="rounded-card border border-primer-300 bg-white p-4">
            <legend className="px-1 text-sm font-semibold">Figure {i + 1}</legend>
            <FigureFields index={i} register={register} large={rows?.[i]?.sizeClass === 'large'} errors={errors} lists={lists} painters={painters} />
            {figures.fields.length > 1 && (
              <Button variant="ghost" size="sm" className="mt-3" onClick={() => figures.remove(i)}>
                <Trash2 aria-hidden="true" className="size-4" />
                Remove figure {i + 1}
              </Button>
            )}
          </fieldset>
        ))}
        <div>
          <Button
            variant="secondary"
            onClick={() => {
              figures.append(emptyFigure(firstTier));
              window.setTimeout(() => setFocus(`figures.${figures.fields.length}.name`), 0);
            }}
          >
            <Plus aria-hidden="true" className="size-4" />
            Add another figure
          </Button>
        </div>
      </section>

      <div className="flex flex-wrap gap-2">
        <Button type="submit" loading={pending}>
          Record commission
        </Button>
        <Button variant="secondary" onClick={onCancel}>
          Cancel
        </Button>
      </div>
    </form>
  );
}
