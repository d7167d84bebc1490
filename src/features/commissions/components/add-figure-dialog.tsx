import { useState } from 'react';
import { useForm, useWatch } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { z } from 'zod';
import { figureInput, type StudioLists } from '../../../../shared/schemas/commissions';
import { Button } from '../../../components/ui/button';
import { Dialog } from '../../../components/ui/dialog';
import { ErrorNote } from '../../../components/ui/error-note';
import { applyServerErrors } from '../../../components/ui/form-errors';
import { useToast } from '../../../components/ui/toast';
import { useAddFigure } from '../api/add-figure';
import { emptyFigure, FigureFields, type FiguresForm, type PersonOption } from './figure-fields';

const oneFigure = z.object({ figures: z.array(figureInput).length(1) });

export function AddFigureDialog({
  open,
  onClose,
  studioId,
  commissionId,
  lists,
  painters,
}: {
  open: boolean;
  onClose: () => void;
  studioId: number;
  commissionId: number;
  lists: StudioLists | undefined;
  painters: PersonOption[];
}) {
  const add = useAddFigure(studioId, commissionId);
  const toast = useToast();
  const [formError, setFormError] = useState<string | null>(null);
  const {
    register,
    handleSubmit,
    control,
    reset,
    setError,
    formState: { errors },
  } = useForm<FiguresForm>({ resolver: zodResolver(oneFigure) as never, defaultValues: { figures: [emptyFigure(lists?.tiers[0]?.key)] } });
  const large = useWatch({ control, name: 'figures.0.sizeClass' }) === 'large';

  const onSubmit = handleSubmit(async (values) => {
    setFormError(null);
    try {
      const f = await add.mutateAsync(values.figures[0]);
      toast.show(`${f.name} added, with its stage checklist.`);
      reset({ figures: [emptyFigure(lists?.tiers[0]?.key)] });
      onClose();
    } catch (err) {
      // The server names fields without the form's "figures.0." prefix.
      if (err instanceof Error && 'fields' in err) {
        const fields = (err as { fields: Record<string, string> }).fields;
        for (const [k, m] of Object.entries(fields)) setError(`figures.0.${k}` as never, { type: 'server', message: m });
        setFormError(Object.keys(fields).length ? null : err.message);
      } else setFormError(applyServerErrors(err, setError));
    }
  });

  return (
    <Dialog open={open} onClose={onClose} title="Add a figure" description="It gets the studio’s stage checklist.">
      <form onSubmit={onSubmit} noValidate className="flex max-h-[70vh] flex-col gap-4 overflow-y-auto p-1">
        {formError && <ErrorNote>{formError}</ErrorNote>}
        <FigureFields index={0} register={register} large={large} errors={errors} lists={lists} painters={painters} />
        <div className="flex flex-wrap justify-end gap-2">
          <Button variant="secondary" onClick={onClose}>
            Cancel
          </Button>
          <Button type="submit" loading={add.isPending}>
            Add figure
          </Button>
        </div>
      </form>
    </Dialog>
  );
}
