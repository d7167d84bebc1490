import { useState } from 'react';
import { useFieldArray, useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { Plus, Trash2 } from 'lucide-react';
import { sizeClasses, sizeClassLabels, type SizeClass } from '../../../../shared/schemas/commissions';
import { enquiryInput, type EnquiryInput, type EnquiryReceived, type PublicStudio } from '../../../../shared/schemas/enquiries';
import { Button } from '../../../components/ui/button';
import { ErrorNote } from '../../../components/ui/error-note';
import { SelectField, TextArea, TextField } from '../../../components/ui/field';
import { applyServerErrors } from '../../../components/ui/form-errors';
import { isApiError } from '../../../lib/api-client';
import { currencyDigits, formatMoney, minutesFromSeconds, pluralize } from '../../../lib/format';
import { useSendEnquiry } from '../api/send-enquiry';
import { PhotoPicker, type PickedPhoto } from './photo-picker';
import { PhotoPickError, scalePhoto } from './scale-photo';

type FigureRow = { name: string; quantity: number; sizeClass: SizeClass };
type FormValues = Omit<EnquiryInput, 'figures' | 'consent'> & { figures: FigureRow[]; consent: boolean };

const emptyFigure = (): FigureRow => ({ name: '', quantity: 1, sizeClass: '28' });
const BASE_FIELDS = ['name', 'email', 'figures', 'tier', 'extras', 'dueDate', 'budget', 'notes', 'consent'];

/** The visitor's enquiry: who they are, the figure list, what they wish for, photos, and leave to be contacted. */
export function EnquiryForm({ slug, studio, onSent }: { slug: string; studio: PublicStudio; onSent: (r: EnquiryReceived, email: string) => void }) {
  const send = useSendEnquiry(slug);
  const [formError, setFormError] = useState<string | null>(null);
  const [photos, setPhotos] = useState<PickedPhoto[]>([]);
  const [photoError, setPhotoError] = useState<string | undefined>();
  const [progress, setProgress] = useState<number | null>(null);
  const {
    register,
    handleSubmit,
    control,
    setError,
    formState: { errors },
  } = useForm<FormValues>({
    resolver: zodResolver(enquiryInput) as never,
    defaultValues: { name: '', email: '', figures: [emptyFigure()], tier: '', extras: [], dueDate: '', budget: '', notes: '', consent: false, website: '' },
  });
  const figures = useFieldArray({ control, name: 'figures' });
  const digits = currencyDigits(studio.currency);

  const onSubmit = handleSubmit(async (values) => {
    setFormError(null);
    setPhotoError(undefined);
    let files: { blob: Blob; name: string }[];
    try {
      files = await Promise.all(photos.map((p) => scalePhoto(p.file)));
    } catch (err) {
      setPhotoError(err instanceof PhotoPickError ? err.message : 'A photo could not be read. Take it out and try another.');
      return;
    }
    try {
      setProgress(files.length ? 0 : null);
      const received = await send.mutateAsync({
        values: values as never,
        photos: files,
        onProgress: (p) => setProgress(Math.round((p.loaded / p.total) * 100)),
      });
      onSent(received, values.email);
    } catch (err) {
      if (isApiError(err, 429)) {
        setFormError(
          `You have sent several enquiries in a short time. Try again in ${pluralize(minutesFromSeconds(err.retryAfter ?? 3600), 'minute')}, or write to the studio directly.`,
        );
      } else if (isApiError(err, 404)) {
        setFormError('This studio is not taking enquiries through its page right now.');
      } else {
        if (isApiError(err) && err.fields.photos) setPhotoError(err.fields.photos);
        const known = [...BASE_FIELDS, ...values.figures.flatMap((_, i) => [`figures.${i}.name`, `figures.${i}.quantity`, `figures.${i}.sizeClass`]), 'photos'];
        const left = applyServerErrors(err, setError, known);
        setFormError(left ?? 'Some fields need a look; the messages are next to them.');
      }
    } finally {
      setProgress(null);
    }
  });

  const figureErrors = errors.figures;
  return (
    <form onSubmit={onSubmit} noValidate className="flex flex-col gap-6" aria-labelledby="enquiry-title">
      {formError && <ErrorNote>{formError}</ErrorNote>}

      <div className="grid gap-4 sm:grid-cols-2">
        <TextField label="Your name" autoComplete="name" maxLength={120} error={errors.name?.message} {...register('name')} />
        <TextField label="E-mail" type="email" inputMode="email" autoComplete="email" maxLength={254} hint="The studio answers you here." error={errors.email?.message} {...register('email')} />
      </div>

      <fieldset className="flex flex-col gap-3">
        <legend className="mb-1 text-base font-semibold">Your figures</legend>
        <p className="-mt-2 text-xs text-sable-600">One line per kind of figure: identical figures go on one line with their number.</p>
        {figureErrors?.message && <p className="text-sm text-oxide-600">{figureErrors.message}</p>}
        <ol className="flex flex-col gap-3">
          {figures.fields.map((field, i) => {
            const e = figureErrors?.[i];
            return (
              <li key={field.id} className="grid grid-cols-[1fr_auto] gap-3 rounded-control border border-primer-300 bg-white/60 p-3 sm:grid-cols-[1fr_6rem_10rem_auto] sm:items-start">
                <TextField label={
                    <>
                      Figure {i + 1}
                      <span className="sr-only">: name</span>
                    </>
                  } maxLength={120} placeholder="e.g. Bog troll" className="col-span-2 sm:col-span-1" error={e?.name?.message} {...register(`figures.${i}.name`)} />
                <TextField
                  label={
                    <>
                      How many<span className="sr-only"> of figure {i + 1}</span>
                    </>
                  }
                  type="number"
                  inputMode="numeric"
                  min={1}
                  max={500}
                  error={e?.quantity?.message}
                  {...register(`figures.${i}.quantity`, { valueAsNumber: true })}
                />
                <SelectField
                  label={
                    <>
                      Base size<span className="sr-only"> of figure {i + 1}</span>
                    </>
                  }
                  error={e?.sizeClass?.message} {...register(`figures.${i}.sizeClass`)}>
                  {sizeClasses.map((s) => (
                    <option key={s} value={s}>
                      {sizeClassLabels[s]}
                    </option>
                  ))}
                </SelectField>
                <div className="col-span-2 flex justify-end sm:col-span-1 sm:pt-6">
                  {figures.fields.length > 1 && (
                    <Button variant="ghost" size="sm" onClick={() => figures.remove(i)} aria-label={`Remove figure ${i + 1}`}>
                      <Trash2 aria-hidden="true" className="size-4" />
                      <span className="sm:sr-only">Remove</span>
                    </Button>
                  )}
                </div>
              </li>
            );
          })}
        </ol>
        <div>
          <Button variant="secondary" size="sm" onClick={() => figures.append(emptyFigure())} disabled={figures.fields.length >= studio.limits.maxFigures}>
            <Plus aria-hidden="true" className="size-4" />
            Add another figure
          </Button>
        </div>
      </fieldset>

      <div className="grid gap-4 sm:grid-cols-2">
        <SelectField label="Tier you would like" optional error={errors.tier?.message} {...register('tier')}>
          <option value="">No preference yet</option>
          {studio.tiers.map((t) => (
            <option key={t.key} value={t.key}>
              {t.label}
              {t.fromMinor !== null ? ` — from ${formatMoney(t.fromMinor, studio.currency)}` : ''}
            </option>
          ))}
        </SelectField>
        <TextField label="Wished by" type="date" optional hint="A date you need them for, if there is one." error={errors.dueDate?.message} {...register('dueDate')} />
      </div>

      {studio.extras.length > 0 && (
        <fieldset>
          <legend className="mb-2 text-sm font-medium">
            Extras <span className="font-normal text-sable-600">(optional)</span>
          </legend>
          <div className="grid grid-cols-2 gap-x-3 gap-y-1">
            {studio.extras.map((x) => (
              <label key={x.key} className="flex min-h-10 items-center gap-2 text-sm">
                <input type="checkbox" value={x.key} className="size-4 accent-verdigris-600" {...register('extras')} />
                {x.label}
              </label>
            ))}
          </div>
        </fieldset>
      )}

      <TextField
        label={`Budget (${studio.currency})`}
        optional
        inputMode="decimal"
        maxLength={16}
        placeholder={digits > 0 ? `e.g. 250 or 250.${'5'.padEnd(digits, '0')}` : 'e.g. 25000'}
        hint="Roughly what you would like to spend, so the studio can suggest a tier."
        error={errors.budget?.message}
        {...register('budget')}
      />

      <TextArea
        label="Notes"
        optional
        rows={5}
        maxLength={4000}
        hint="Colours, the look you are after, the game or army, anything the studio should know. At most 4000 characters."
        error={errors.notes?.message}
        {...register('notes')}
      />

      <PhotoPicker photos={photos} onChange={setPhotos} max={studio.limits.maxPhotos} error={photoError} />

      {/* Hidden from people; form-filling robots fill it in and their enquiry goes nowhere. */}
      <div aria-hidden="true" className="absolute -left-[9999px] h-px w-px overflow-hidden">
        <label htmlFor="enquiry-website">Leave this field empty</label>
        <input id="enquiry-website" type="text" tabIndex={-1} autoComplete="off" {...register('website')} />
      </div>

      <div className="flex flex-col gap-1">
        <label className="flex items-start gap-3 text-sm">
          <input type="checkbox" className="mt-0.5 size-5 shrink-0 accent-verdigris-600" aria-invalid={errors.consent ? true : undefined} aria-describedby={errors.consent ? 'consent-error' : undefined} {...register('consent')} />
          <span>
            {studio.name} may contact me by e-mail about this enquiry and keep what I sent for as long as it needs to answer it.
          </span>
        </label>
        {errors.consent && (
          <p id="consent-error" className="ml-8 text-sm text-oxide-600">
            {errors.consent.message}
          </p>
        )}
      </div>

      <div className="flex flex-wrap items-center gap-3">
        <Button type="submit" loading={send.isPending} className="w-full sm:w-auto">
          Send the enquiry
        </Button>
        {progress !== null && (
          <span className="text-sm text-sable-600" role="status">
            Sending photos… {progress}%
          </span>
        )}
      </div>
    </form>
  );
}
