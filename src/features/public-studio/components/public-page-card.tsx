import { useState } from 'react';
import { useForm, useWatch } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { ExternalLink, Globe } from 'lucide-react';
import { publicPageInput, type PublicPageSettings } from '../../../../shared/schemas/enquiries';
import { Badge } from '../../../components/ui/badge';
import { Button } from '../../../components/ui/button';
import { Card } from '../../../components/ui/card';
import { ErrorNote } from '../../../components/ui/error-note';
import { TextArea, TextField } from '../../../components/ui/field';
import { applyServerErrors } from '../../../components/ui/form-errors';
import { LoadingBlock } from '../../../components/ui/spinner';
import { useToast } from '../../../components/ui/toast';
import { usePublicPage } from '../api/get-public-page';
import { useSavePublicPage, type PublicPageBody } from '../api/save-public-page';

function SettingsForm({ studioId, page, onDone }: { studioId: number; page: PublicPageSettings; onDone: () => void }) {
  const save = useSavePublicPage(studioId);
  const toast = useToast();
  const [formError, setFormError] = useState<string | null>(null);
  const {
    register,
    handleSubmit,
    control,
    setError,
    formState: { errors },
  } = useForm<PublicPageBody>({
    resolver: zodResolver(publicPageInput) as never,
    defaultValues: { enabled: page.enabled, intro: page.intro ?? '', turnaroundText: page.turnaroundText ?? '', turnaroundSource: page.turnaroundSource },
  });
  const source = useWatch({ control, name: 'turnaroundSource' });
  const onSubmit = handleSubmit(async (values) => {
    setFormError(null);
    try {
      const saved = await save.mutateAsync(values);
      toast.show(saved.enabled ? 'Saved. Your page is taking enquiries.' : 'Saved. Your page is switched off.');
      onDone();
    } catch (err) {
      setFormError(applyServerErrors(err, setError, ['enabled', 'intro', 'turnaroundText', 'turnaroundSource']));
    }
  });
  return (
    <form onSubmit={onSubmit} noValidate className="flex flex-col gap-4">
      {formError && <ErrorNote>{formError}</ErrorNote>}
      <label className="flex items-start gap-3 text-sm">
        <input type="checkbox" className="mt-0.5 size-5 accent-verdigris-600" {...register('enabled')} />
        <span>
          <span className="font-medium">Show the page and take enquiries</span>
          <span className="block text-xs text-sable-600">Switched off, the address answers “no studio page here”.</span>
        </span>
      </label>
      <TextArea label="A few words about the studio" optional rows={3} maxLength={1000} hint="Shown at the top of the page. Left empty, the studio’s own description is used." error={errors.intro?.message} {...register('intro')} />
      <fieldset className="flex flex-col gap-2">
        <legend className="mb-1 text-sm font-medium">Turnaround</legend>
        <label className="flex items-center gap-2 text-sm">
          <input type="radio" value="forecast" className="size-4 accent-verdigris-600" {...register('turnaroundSource')} />
          From the queue’s forecast (when new work could start), with the text below as a fallback
        </label>
        <label className="flex items-center gap-2 text-sm">
          <input type="radio" value="text" className="size-4 accent-verdigris-600" {...register('turnaroundSource')} />
          Only the text below
        </label>
      </fieldset>
      <TextField
        label="Turnaround in your words"
        optional={source === 'forecast'}
        maxLength={300}
        placeholder="e.g. Our queue is usually six to ten weeks."
        error={errors.turnaroundText?.message}
        {...register('turnaroundText')}
      />
      <div className="flex flex-wrap gap-2">
        <Button type="submit" loading={save.isPending}>
          Save the page
        </Button>
        <Button variant="secondary" onClick={onDone}>
          Cancel
        </Button>
      </div>
    </form>
  );
}

/** The owner's view of the studio's public page: on or off, its address, and its words. */
export function PublicPageCard({ studioId }: { studioId: number }) {
  const page = usePublicPage(studioId);
  const [editing, setEditing] = useState(false);
  if (page.isPending) return <LoadingBlock label="Loading the public page…" />;
  if (page.error) return <ErrorNote>{page.error.message}</ErrorNote>;
  const p = page.data;
  const url = `${window.location.origin}${p.path}`;
  return (
    <Card
      title={
        <span className="flex flex-wrap items-center gap-2">
          <Globe aria-hidden="true" className="size-5 text-verdigris-600" />
          Your public page
        </span>
      }
      actions={
        !editing && (
          <Button variant="secondary" size="sm" onClick={() => setEditing(true)}>
            Edit the page
          </Button>
        )
      }
    >
      {editing ? (
        <SettingsForm studioId={studioId} page={p} onDone={() => setEditing(false)} />
      ) : (
        <div className="flex flex-col gap-2 text-sm">
          <div>
            <Badge tone={p.enabled ? 'success' : 'neutral'}>{p.enabled ? 'Taking enquiries' : 'Switched off'}</Badge>
          </div>
          <p>
            Share this address with people who want to ask about a commission:{' '}
            <a href={p.path} target="_blank" rel="noreferrer" className="inline-flex items-center gap-1 break-all">
              {url}
              <ExternalLink aria-hidden="true" className="size-3.5 shrink-0" />
              <span className="sr-only">(opens in a new tab)</span>
            </a>
          </p>
          {!p.enabled && <p className="text-sable-600">The page is off: nobody can send an enquiry until you switch it on.</p>}
        </div>
      )}
    </Card>
  );
}
