import { useState } from 'react';
import { Link, useNavigate, useParams, useSearchParams } from 'react-router-dom';
import { ChevronLeft, Trash2 } from 'lucide-react';
import { isHex, normalizeHex } from '../../../../shared/color';
import { Button } from '../../../components/ui/button';
import { Card } from '../../../components/ui/card';
import { Dialog } from '../../../components/ui/dialog';
import { ErrorNote } from '../../../components/ui/error-note';
import { PageTitle, useDocumentTitle } from '../../../components/ui/page-title';
import { LoadingBlock } from '../../../components/ui/spinner';
import { useToast } from '../../../components/ui/toast';
import { isApiError } from '../../../lib/api-client';
import { pluralize } from '../../../lib/format';
import { useStudioScope } from '../../../lib/studio-scope';
import { usePaint } from '../api/get-paint';
import { useRemovePaint } from '../api/remove-paint';
import { useSavePaint } from '../api/save-paint';
import { CsvImport } from '../components/csv-import';
import { PaintForm } from '../components/paint-form';

export function BackToRack() {
  return (
    <Link to=".." relative="path" className="mb-3 inline-flex items-center gap-1 text-sm">
      <ChevronLeft aria-hidden="true" className="size-4" />
      Paint rack
    </Link>
  );
}

export function PaintNewRoute() {
  const { studioId } = useStudioScope();
  const [params] = useSearchParams();
  const hex = params.get('hex') ?? '';
  const save = useSavePaint(studioId);
  const navigate = useNavigate();
  const toast = useToast();
  return (
    <>
      <BackToRack />
      <PageTitle title="Add a paint" />
      <Card>
        <PaintForm
          startHex={isHex(hex) ? normalizeHex(hex) : undefined}
          submitLabel="Add paint"
          pending={save.isPending}
          onCancel={() => navigate('..', { relative: 'path' })}
          onSave={async (body) => {
            const p = await save.mutateAsync(body);
            toast.show(`${p.name} is on the rack.`);
            navigate('..', { relative: 'path' });
          }}
        />
      </Card>
    </>
  );
}

export function PaintEditRoute() {
  const { studioId } = useStudioScope();
  const paintId = Number(useParams().paintId);
  const valid = Number.isInteger(paintId) && paintId > 0;
  const paint = usePaint(studioId, paintId, valid);
  const save = useSavePaint(studioId, paintId);
  const remove = useRemovePaint(studioId);
  const navigate = useNavigate();
  const toast = useToast();
  const [confirm, setConfirm] = useState(false);
  const [removeError, setRemoveError] = useState<string | null>(null);
  useDocumentTitle(paint.data?.name ?? 'Paint');

  if (!valid || isApiError(paint.error, 404)) {
    return (
      <>
        <BackToRack />
        <PageTitle title="Paint not found" />
        <ErrorNote>This paint is not on the rack. It may have been taken off, or the link is wrong.</ErrorNote>
      </>
    );
  }
  if (paint.isPending) return <LoadingBlock label="Loading paint…" />;
  if (paint.error) return <ErrorNote title="This paint did not load">{paint.error.message}</ErrorNote>;
  const p = paint.data;

  return (
    <>
      <BackToRack />
      <PageTitle
        title={p.name}
        description={p.recipeCount ? `Used in ${pluralize(p.recipeCount, 'recipe')}.` : 'Not used in any recipe yet.'}
        actions={
          <Button variant="secondary" onClick={() => setConfirm(true)}>
            <Trash2 aria-hidden="true" className="size-4" />
            Take off the rack
          </Button>
        }
      />
      <Card>
        <PaintForm
          key={p.updatedAt}
          paint={p}
          submitLabel="Save changes"
          pending={save.isPending}
          onSave={async (body) => {
            await save.mutateAsync(body);
            toast.show('Paint saved.');
          }}
        />
      </Card>
      <Dialog
        open={confirm}
        onClose={() => {
          setConfirm(false);
          setRemoveError(null);
        }}
        title={`Take ${p.name} off the rack?`}
        description={
          p.recipeCount
            ? `It is in ${pluralize(p.recipeCount, 'recipe')}, so it stays until you take it out of them. To show you have none left, set its pots to 0.`
            : 'Its stock and notes go with it. This cannot be undone.'
        }
        footer={
          p.recipeCount ? (
            <Button variant="secondary" onClick={() => setConfirm(false)}>
              Close
            </Button>
          ) : (
          <>
            <Button variant="secondary" onClick={() => setConfirm(false)}>
              Keep it
            </Button>
            <Button
              variant="danger"
              loading={remove.isPending}
              onClick={async () => {
                setRemoveError(null);
                try {
                  await remove.mutateAsync(p.id);
                  toast.show(`${p.name} is off the rack.`);
                  navigate('..', { relative: 'path' });
                } catch (err) {
                  setRemoveError(isApiError(err) ? err.message : 'That did not work. Try again.');
                }
              }}
            >
              Take it off
            </Button>
          </>
          )
        }
      >
        {removeError && <ErrorNote>{removeError}</ErrorNote>}
      </Dialog>
    </>
  );
}

export function PaintsImportRoute() {
  return (
    <>
      <BackToRack />
      <PageTitle title="Import paints from CSV" description="Good rows are added; a row with a problem is left out and listed by its line, so you can fix it and import again." />
      <Card>
        <CsvImport />
      </Card>
    </>
  );
}
