import { useState } from 'react';
import { useForm, useWatch } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { Mail, PackageOpen } from 'lucide-react';
import { modelSupplierLabels, modelSuppliers, modelsInInput, type ModelsIn, type ModelsInFormValues } from '../../../../shared/schemas/shipments';
import { Badge } from '../../../components/ui/badge';
import { Button } from '../../../components/ui/button';
import { Card } from '../../../components/ui/card';
import { Dialog } from '../../../components/ui/dialog';
import { ErrorNote } from '../../../components/ui/error-note';
import { TextArea, TextField } from '../../../components/ui/field';
import { applyServerErrors } from '../../../components/ui/form-errors';
import { LoadingBlock } from '../../../components/ui/spinner';
import { useToast } from '../../../components/ui/toast';
import { isApiError } from '../../../lib/api-client';
import { formatDate, formatDateTime, pluralize } from '../../../lib/format';
import { useModelsIn } from '../api/get-models-in';
import { useSaveModelsIn } from '../api/save-models-in';
import { useSendModelsNotice } from '../api/send-models-notice';

const day = (d: string) => formatDate(`${d}T12:00:00Z`, 'UTC');

function StateBadge({ m }: { m: ModelsIn }) {
  if (!m.recorded) return <Badge>Not recorded yet</Badge>;
  if (m.complete) return <Badge tone="success">All here, in good shape</Badge>;
  const parts = [m.missing ? `${m.missing} missing` : '', m.damaged ? `${m.damaged} damaged` : ''].filter(Boolean);
  return <Badge tone="attention">{parts.join(' · ') || 'Checked'}</Badge>;
}

function valuesOf(m: ModelsIn): ModelsInFormValues {
  return {
    supplier: m.supplier,
    retailer: m.retailer ?? '',
    expectedOn: m.expectedOn ?? '',
    receivedOn: m.receivedOn ?? '',
    carrier: m.carrier ?? '',
    tracking: m.tracking ?? '',
    note: m.note ?? '',
    figures: m.figures.map((f) => ({ figureId: f.figureId, received: f.received, damaged: f.damaged, note: f.note ?? '' })),
  };
}

function ModelsInForm({ studioId, commissionId, m, onDone }: { studioId: number; commissionId: number; m: ModelsIn; onDone: () => void }) {
  const save = useSaveModelsIn(studioId, commissionId);
  const toast = useToast();
  const [formError, setFormError] = useState<string | null>(null);
  const {
    register,
    handleSubmit,
    control,
    setError,
    setValue,
    formState: { errors },
  } = useForm<ModelsInFormValues>({ resolver: zodResolver(modelsInInput) as never, defaultValues: valuesOf(m) });
  const supplier = useWatch({ control, name: 'supplier' });
  const onSubmit = handleSubmit(async (values) => {
    setFormError(null);
    try {
      await save.mutateAsync(values);
      toast.show('Saved what arrived.');
      onDone();
    } catch (err) {
      setFormError(applyServerErrors(err, setError));
    }
  });
  return (
    <form onSubmit={onSubmit} noValidate className="flex flex-col gap-5">
      {formError && <ErrorNote>{formError}</ErrorNote>}
      <fieldset className="flex flex-col gap-2">
        <legend className="mb-1 text-sm font-medium">Who supplies the models</legend>
        <div className="flex flex-col gap-2 sm:flex-row sm:flex-wrap sm:gap-4">
          {modelSuppliers.map((s) => (
            <label key={s} className="flex min-h-9 items-center gap-2 text-sm">
              <input type="radio" value={s} className="size-4 accent-verdigris-600" {...register('supplier')} />
              {modelSupplierLabels[s]}
            </label>
          ))}
        </div>
        {errors.supplier && <p className="text-sm text-oxide-600">{errors.supplier.message}</p>}
      </fieldset>
      {supplier === 'retailer' && <TextField label="Shop" optional maxLength={120} error={errors.retailer?.message} {...register('retailer')} />}
      <div className="grid gap-4 sm:grid-cols-2">
        <TextField label="Expected on" type="date" optional error={errors.expectedOn?.message} {...register('expectedOn')} />
        <TextField label="Arrived on" type="date" optional error={errors.receivedOn?.message} {...register('receivedOn')} />
        <TextField label="Carrier" optional maxLength={80} error={errors.carrier?.message} {...register('carrier')} />
        <TextField label="Tracking number" optional maxLength={80} spellCheck={false} error={errors.tracking?.message} {...register('tracking')} />
      </div>

      <fieldset className="flex flex-col gap-2">
        <legend className="mb-1 text-sm font-medium">What arrived, against the figure list</legend>
        {m.figures.length === 0 ? (
          <p className="text-sm text-sable-600">The commission has no figures yet; add them first, then check them off here.</p>
        ) : (
          <ul className="flex flex-col divide-y divide-primer-300 rounded-control border border-primer-300 bg-white/60">
            {m.figures.map((f, i) => {
              const e = errors.figures?.[i];
              return (
                <li key={f.figureId} className="grid grid-cols-2 gap-3 p-3 sm:grid-cols-[1fr_9rem_auto] sm:items-start">
                  <div className="col-span-2 flex flex-col gap-1 sm:col-span-1">
                    <span className="font-medium">{f.name}</span>
                    <span className="text-xs text-sable-600">{pluralize(f.quantity, 'model')} on the list</span>
                    <Button variant="ghost" size="sm" className="self-start" onClick={() => setValue(`figures.${i}.received`, f.quantity, { shouldDirty: true })}>
                      All {f.quantity} arrived<span className="sr-only"> of {f.name}</span>
                    </Button>
                  </div>
                  <TextField
                    label={
                      <>
                        Arrived<span className="sr-only"> of {f.name}</span>
                      </>
                    }
                    type="number"
                    inputMode="numeric"
                    min={0}
                    max={f.quantity}
                    hint={`of ${f.quantity}`}
                    error={e?.received?.message}
                    {...register(`figures.${i}.received`, { valueAsNumber: true })}
                  />
                  <div className="flex flex-col gap-2 pt-6">
                    <label className="flex min-h-10 items-center gap-2 text-sm">
                      <input type="checkbox" className="size-5 accent-verdigris-600" {...register(`figures.${i}.damaged`)} />
                      Damaged<span className="sr-only">: {f.name}</span>
                    </label>
                  </div>
                  <TextField label={`What is wrong with ${f.name}`} optional maxLength={300} className="col-span-2 sm:col-span-3" placeholder="e.g. sword snapped at the hilt" error={e?.note?.message} {...register(`figures.${i}.note`)} />
                </li>
              );
            })}
          </ul>
        )}
      </fieldset>

      <TextArea label="Studio note" optional rows={3} maxLength={2000} hint="Only the studio sees this." error={errors.note?.message} {...register('note')} />
      <div className="flex flex-wrap gap-2">
        <Button type="submit" loading={save.isPending}>
          Save what arrived
        </Button>
        <Button variant="secondary" onClick={onDone}>
          Cancel
        </Button>
      </div>
    </form>
  );
}

function NoticeDialog({ studioId, commissionId, m, open, onClose }: { studioId: number; commissionId: number; m: ModelsIn; open: boolean; onClose: () => void }) {
  const send = useSendModelsNotice(studioId, commissionId);
  const toast = useToast();
  const [message, setMessage] = useState(m.noticeDraft);
  const [error, setError] = useState<string | null>(null);
  return (
    <Dialog
      open={open}
      onClose={onClose}
      title="Write to the client about the models"
      description="Sent by e-mail to the client. Share photos of the damage from the Photos section so they can see it."
      footer={
        <>
          <Button variant="secondary" onClick={onClose}>
            Cancel
          </Button>
          <Button
            loading={send.isPending}
            onClick={async () => {
              setError(null);
              try {
                await send.mutateAsync({ message });
                toast.show('Your note is on its way to the client.');
                onClose();
              } catch (err) {
                setError(isApiError(err) && err.fields.message ? err.fields.message : err instanceof Error ? err.message : 'That did not work. Try again.');
              }
            }}
          >
            Send the note
          </Button>
        </>
      }
    >
      <TextArea label="Your note" rows={10} maxLength={4000} value={message} onChange={(e) => setMessage(e.target.value)} error={error ?? undefined} />
    </Dialog>
  );
}

/**
 * "Models in" on the studio's commission page: who supplies the models, the parcel, what arrived and
 * in what state, and (for owners) a note to the client when something is missing or damaged.
 */
export function ModelsInSection({ studioId, commissionId, canNotify, timezone, locked }: { studioId: number; commissionId: number; canNotify: boolean; timezone: string; locked: boolean }) {
  const models = useModelsIn(studioId, commissionId);
  const [editing, setEditing] = useState(false);
  const [writing, setWriting] = useState(false);
  return (
    <section aria-labelledby="models-in-title" className="flex flex-col gap-3">
      <div className="flex flex-wrap items-center justify-between gap-2">
        <h2 id="models-in-title" className="text-lg font-semibold">
          Models in
        </h2>
        {models.data && !editing && !locked && (
          <Button variant="secondary" size="sm" onClick={() => setEditing(true)}>
            <PackageOpen aria-hidden="true" className="size-4" />
            {models.data.recorded ? 'Update what arrived' : 'Record what arrived'}
          </Button>
        )}
      </div>
      {models.isPending ? (
        <LoadingBlock label="Loading the models received…" />
      ) : models.error ? (
        <ErrorNote>{models.error.message}</ErrorNote>
      ) : (
        <Card>
          {editing ? (
            <ModelsInForm studioId={studioId} commissionId={commissionId} m={models.data} onDone={() => setEditing(false)} />
          ) : (
            <div className="flex flex-col gap-3 text-sm">
              <div className="flex flex-wrap items-center gap-2">
                <StateBadge m={models.data} />
                {models.data.recorded && <span>{modelSupplierLabels[models.data.supplier]}{models.data.retailer ? ` (${models.data.retailer})` : ''}</span>}
              </div>
              {models.data.recorded ? (
                <>
                  <p className="text-sable-600">
                    {models.data.receivedOn ? `Arrived ${day(models.data.receivedOn)}` : models.data.expectedOn ? `Expected ${day(models.data.expectedOn)}` : 'No dates yet'}
                    {models.data.carrier ? ` · ${models.data.carrier}` : ''}
                    {models.data.tracking ? ` · tracking ${models.data.tracking}` : ''}
                  </p>
                  <ul className="flex flex-col gap-1">
                    {models.data.figures.map((f) => (
                      <li key={f.figureId} className="flex flex-wrap gap-x-2">
                        <span className="figures">
                          {f.received} of {f.quantity}
                        </span>
                        <span>{f.name}</span>
                        {f.damaged && <span className="text-oxide-600">damaged{f.note ? `: ${f.note}` : ''}</span>}
                        {!f.damaged && f.note && <span className="text-sable-600">{f.note}</span>}
                      </li>
                    ))}
                  </ul>
                  {models.data.note && <p className="whitespace-pre-line text-sable-600">{models.data.note}</p>}
                </>
              ) : (
                <p className="text-sable-600">When the models arrive, check them against the figure list here, so nothing missing or broken is found late.</p>
              )}
              <p className="text-xs text-sable-600">
                Photos of how they arrived go in <a href="#photos-title">Photos</a>: choose “As received”.
              </p>
              {canNotify && models.data.recorded && (
                <div className="flex flex-wrap items-center gap-3 border-t border-primer-300 pt-3">
                  <Button variant={models.data.complete ? 'secondary' : 'primary'} size="sm" onClick={() => setWriting(true)}>
                    <Mail aria-hidden="true" className="size-4" />
                    Write to the client
                  </Button>
                  {models.data.noticeSentAt && <span className="text-xs text-sable-600">Last note sent {formatDateTime(models.data.noticeSentAt, timezone)}</span>}
                </div>
              )}
            </div>
          )}
        </Card>
      )}
      {canNotify && models.data && writing && <NoticeDialog studioId={studioId} commissionId={commissionId} m={models.data} open={writing} onClose={() => setWriting(false)} />}
    </section>
  );
}
