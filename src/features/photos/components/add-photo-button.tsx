import { useState } from 'react';
import { Camera } from 'lucide-react';
import { Button } from '../../../components/ui/button';
import { Dialog } from '../../../components/ui/dialog';
import { useToast } from '../../../components/ui/toast';
import { PhotoUploader } from './photo-uploader';

/** A progress photo straight from a bench card: the figure and stage are already known. */
export function AddPhotoButton({ studioId, commissionId, figureId, stageId, figureName, stageName }: { studioId: number; commissionId: number; figureId: number; stageId: number | null; figureName: string; stageName: string | null }) {
  const [open, setOpen] = useState(false);
  const toast = useToast();
  return (
    <>
      <Button variant="ghost" size="sm" aria-label={`Add a photo of ${figureName}`} onClick={() => setOpen(true)}>
        <Camera aria-hidden="true" className="size-4" />
        Photo
      </Button>
      <Dialog open={open} onClose={() => setOpen(false)} title={`Photo of ${figureName}`} description={stageName ? `Filed under ${stageName}.` : undefined}>
        <PhotoUploader
          studioId={studioId}
          commissionId={commissionId}
          kinds={['progress', 'condition', 'packing']}
          fixed={{ figureId, stageId }}
          onUploaded={(n) => toast.show(n === 1 ? 'Photo added.' : `${n} photos added.`)}
        />
      </Dialog>
    </>
  );
}
