import { useState } from 'react';
import type { Role } from '../../../../shared/schemas/common';
import { Button } from '../../../components/ui/button';
import { ErrorNote } from '../../../components/ui/error-note';
import { TextArea } from '../../../components/ui/field';
import { LoadingBlock } from '../../../components/ui/spinner';
import { cn } from '../../../lib/cn';
import { formatDateTime } from '../../../lib/format';
import { useAddComment } from '../api/add-comment';
import { useComments } from '../api/get-comments';

const roleWord: Record<Role, string> = { owner: 'Studio', painter: 'Studio', client: 'Client' };

/** The conversation between studio and client about one commission. */
export function CommentsThread({ studioId, commissionId, userId, timezone }: { studioId: number; commissionId: number; userId: number; timezone: string }) {
  const comments = useComments(studioId, commissionId);
  const add = useAddComment(studioId, commissionId);
  const [body, setBody] = useState('');
  const [error, setError] = useState<string | undefined>();

  async function send() {
    if (!body.trim()) {
      setError('Write a comment first.');
      return;
    }
    try {
      await add.mutateAsync(body.trim());
      setBody('');
    } catch (err) {
      setError(err instanceof Error ? err.message : 'The comment did not go out. Try again.');
    }
  }

  return (
    <div className="flex flex-col gap-4">
      {comments.isPending ? (
        <LoadingBlock label="Loading comments…" />
      ) : comments.error ? (
        <ErrorNote>{comments.error.message}</ErrorNote>
      ) : comments.data.length === 0 ? (
        <p className="text-sm text-sable-600">No comments yet. Questions and answers about this commission go here.</p>
      ) : (
        <ol aria-label="Comments" className="flex flex-col gap-3">
          {comments.data.map((c) => {
            const mine = c.user?.id === userId;
            return (
              <li key={c.id} className={cn('max-w-prose rounded-card border p-3 text-sm', mine ? 'self-end border-verdigris-600 bg-verdigris-100' : 'border-primer-300 bg-white')}>
                <p className="text-xs text-sable-600">
                  <span className="font-semibold text-sable-900">{mine ? 'You' : (c.user?.name ?? 'Someone no longer here')}</span>
                  {c.user?.role && !mine && ` · ${roleWord[c.user.role]}`} · <time dateTime={c.createdAt}>{formatDateTime(c.createdAt, timezone)}</time>
                </p>
                <p className="mt-1 whitespace-pre-line break-words">{c.body}</p>
              </li>
            );
          })}
        </ol>
      )}
      <form
        className="flex max-w-2xl flex-col gap-2"
        onSubmit={(e) => {
          e.preventDefault();
          void send();
        }}
      >
        <TextArea
          label="Write a comment"
          rows={3}
          value={body}
          error={error}
          onChange={(e) => {
            setBody(e.target.value);
            setError(undefined);
          }}
        />
        <div>
          <Button type="submit" loading={add.isPending}>
            Send comment
          </Button>
        </div>
      </form>
    </div>
  );
}
