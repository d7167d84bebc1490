import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { formatMoney } from '../../../../shared/money';
import { acceptQuoteInput, type Quote } from '../../../../shared/schemas/quotes';
import { Button } from '../../../components/ui/button';
import { Card } from '../../../components/ui/card';
import { Dialog } from '../../../components/ui/dialog';
import { ErrorNote } from '../../../components/ui/error-note';
import { TextArea, TextField } from '../../../components/ui/field';
import { applyServerErrors } from '../../../components/ui/form-errors';
import { useToast } from '../../../components/ui/toast';
import { useAcceptQuote, useDeclineQuote, useRequestQuoteChanges } from '../api/quote-mutations';

function AcceptForm({ studioId, quote }: { studioId: number; quote: Quote }) {
  const accept = useAcceptQuote(studioId, quote.id);
  const toast = useToast();
  const [formError, setFormError] = useState<string | null>(null);
  const {
    register,
    handleSubmit,
    setError,
    formState: { errors },
  } = useForm({ resolver: zodResolver(acceptQuoteInput), defaultValues: { name: '', acceptTerms: false as unknown as true } });

  const onSubmit = handleSubmit(async (values) => {
    setFormError(null);
    try {
      await accept.mutateAsync(values);
      toast.show('Quote accepted — thank you. Your deposit invoice is ready.');
    } catch (err) {
      setFormError(applyServerErrors(err, setError, ['name', 'acceptTerms']));
    }
  });

  return (
    <form onSubmit={onSubmit} noValidate className="flex flex-col gap-4" aria-label="Accept the quote">
      {formError && <ErrorNote>{formError}</ErrorNote>}
      <p className="text-sm">
        Accepting books your place: you then pay a deposit of{' '}
        <span className="figures font-semibold">{formatMoney(quote.deposit, quote.currency)}</span>, and the balance of{' '}
        <span className="figures font-semibold">{formatMoney(quote.balance, quote.currency)}</span> once you have approved the finished figures.
      </p>
      <TextField label="Your full name" autoComplete="name" className="max-w-sm" hint="Typing your name is how you sign the quote." error={errors.name?.message} {...register('name')} />
      <div className="flex flex-col gap-1">
        <label className="flex items-start gap-2 text-sm">
          <input
            type="checkbox"
            className="mt-0.5 size-4 accent-verdigris-600"
            aria-invalid={errors.acceptTerms ? true : undefined}
            aria-describedby={errors.acceptTerms ? 'accept-terms-error' : undefined}
            {...register('acceptTerms')}
          />
          <span>I have read the studio’s terms above and accept them.</span>
        </label>
        {errors.acceptTerms && (
          <p id="accept-terms-error" className="text-sm text-oxide-600">
            {errors.acceptTerms.message}
          </p>
        )}
      </div>
      <div>
        <Button type="submit" loading={accept.isPending}>
          Accept quote
        </Button>
      </div>
    </form>
  );
}

function CommentDialog({
  open,
  onClose,
  title,
  description,
  label,
  required,
  submitLabel,
  danger,
  pending,
  onSubmit,
}: {
  open: boolean;
  onClose: () => void;
  title: string;
  description: string;
  label: string;
  required: boolean;
  submitLabel: string;
  danger?: boolean;
  pending: boolean;
  onSubmit: (comment: string) => Promise<void>;
}) {
  const [comment, setComment] = useState('');
  const [error, setError] = useState<string | null>(null);
  return (
    <Dialog open={open} onClose={onClose} title={title} description={description}>
      <form
        noValidate
        className="flex flex-col gap-4"
        onSubmit={async (e) => {
          e.preventDefault();
          if (required && !comment.trim()) {
            setError('Say what you would like changed.');
            return;
          }
          setError(null);
          try {
            await onSubmit(comment.trim());
          } catch (err) {
            setError(err instanceof Error ? err.message : 'That did not go through. Try again.');
          }
        }}
      >
        <TextArea label={label} optional={!required} rows={5} value={comment} onChange={(e) => setComment(e.target.value)} error={error ?? undefined} />
        <div className="flex flex-wrap justify-end gap-2">
          <Button variant="secondary" onClick={onClose}>
            Cancel
          </Button>
          <Button type="submit" variant={danger ? 'danger' : 'primary'} loading={pending}>
            {submitLabel}
          </Button>
        </div>
      </form>
    </Dialog>
  );
}

/** What a client can do with a sent quote: accept it (typed name and terms), ask for changes, or decline. */
export function ClientDecision({ studioId, quote, studioName }: { studioId: number; quote: Quote; studioName: string }) {
  const [open, setOpen] = useState<'changes' | 'decline' | null>(null);
  const changes = useRequestQuoteChanges(studioId, quote.id);
  const decline = useDeclineQuote(studioId, quote.id);
  const toast = useToast();
  const can = (a: Quote['allowedActions'][number]) => quote.allowedActions.includes(a);
  if (!can('accept') && !can('request-changes') && !can('decline')) return null;
  return (
    <Card title="Your answer" description={`${studioName} is waiting to hear from you.`}>
      <div className="flex flex-col gap-6">
        {can('accept') && <AcceptForm studioId={studioId} quote={quote} />}
        <div className="flex flex-col gap-2 border-t border-primer-300 pt-4">
          <p className="text-sm text-sable-600">Not quite right?</p>
          <div className="flex flex-wrap gap-2">
            {can('request-changes') && (
              <Button variant="secondary" onClick={() => setOpen('changes')}>
                Ask for changes
              </Button>
            )}
            {can('decline') && (
              <Button variant="ghost" onClick={() => setOpen('decline')}>
                Decline
              </Button>
            )}
          </div>
        </div>
      </div>
      {open === 'changes' && (
        <CommentDialog
          open
          onClose={() => setOpen(null)}
          title="Ask for changes"
          description={`Tell ${studioName} what you would like different; they can send you a new version.`}
          label="What would you like changed?"
          required
          submitLabel="Send the request"
          pending={changes.isPending}
          onSubmit={async (comment) => {
            await changes.mutateAsync({ comment });
            toast.show('Your request is with the studio.');
            setOpen(null);
          }}
        />
      )}
      {open === 'decline' && (
        <CommentDialog
          open
          onClose={() => setOpen(null)}
          title="Decline this quote?"
          description="The studio will know you are not going ahead with it."
          label="Anything you would like to tell them"
          required={false}
          submitLabel="Decline quote"
          danger
          pending={decline.isPending}
          onSubmit={async (comment) => {
            await decline.mutateAsync({ comment: comment || undefined });
            toast.show('Quote declined.');
            setOpen(null);
          }}
        />
      )}
    </Card>
  );
}
