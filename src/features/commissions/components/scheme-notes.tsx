import { useState } from 'react';
import { Button } from '../../../components/ui/button';
import { TextArea } from '../../../components/ui/field';
import { useToast } from '../../../components/ui/toast';
import { useUpdateSchemeNotes } from '../api/update-scheme-notes';

/** Notes on the colour scheme, written by the client and the owner together. */
export function SchemeNotes({ studioId, commissionId, notes, canEdit, hint }: { studioId: number; commissionId: number; notes: string | null; canEdit: boolean; hint?: string }) {
  const save = useUpdateSchemeNotes(studioId, commissionId);
  const toast = useToast();
  const [text, setText] = useState(notes ?? '');
  const [error, setError] = useState<string | undefined>();
  const [saved, setSaved] = useState(notes ?? '');
  if ((notes ?? '') !== saved) {
    // Someone else saved meanwhile: show theirs unless this person has typed something.
    if (text === saved) setText(notes ?? '');
    setSaved(notes ?? '');
  }

  if (!canEdit) {
    return notes ? <p className="text-sm whitespace-pre-line">{notes}</p> : <p className="text-sm text-sable-600">No scheme notes yet.</p>;
  }
  return (
    <form
      className="flex max-w-2xl flex-col gap-2"
      onSubmit={async (e) => {
        e.preventDefault();
        try {
          await save.mutateAsync(text.trim());
          toast.show('Scheme notes saved.');
        } catch (err) {
          setError(err instanceof Error ? err.message : 'The notes did not save. Try again.');
        }
      }}
    >
      <TextArea
        label="Scheme notes"
        rows={5}
        value={text}
        error={error}
        hint={hint}
        onChange={(e) => {
          setText(e.target.value);
          setError(undefined);
        }}
      />
      <div>
        <Button type="submit" variant="secondary" loading={save.isPending} disabled={text.trim() === (notes ?? '').trim()}>
          Save scheme notes
        </Button>
      </div>
    </form>
  );
}
