import type { Page } from '../../../shared/schemas/common';
import { Button } from './button';

/**
 * "41–60 of 212" with Previous and Next under a paged list; shown only when there is more than one page.
 * `onOffset` gets the first row of the page asked for (0 for the first page).
 */
export function Pager({ label, page, onOffset }: { label: string; page: Pick<Page<unknown>, 'items' | 'total' | 'limit' | 'offset'>; onOffset: (offset: number) => void }) {
  if (page.total <= page.limit) return null;
  return (
    <nav aria-label={label} className="mt-4 flex flex-wrap items-center justify-between gap-2 text-sm">
      <span className="figures text-sable-600">
        {page.offset + 1}–{Math.min(page.offset + page.items.length, page.total)} of {page.total}
      </span>
      <span className="flex gap-2">
        <Button variant="secondary" size="sm" disabled={page.offset === 0} onClick={() => onOffset(Math.max(0, page.offset - page.limit))}>
          Previous
        </Button>
        <Button variant="secondary" size="sm" disabled={page.offset + page.limit >= page.total} onClick={() => onOffset(page.offset + page.limit)}>
          Next
        </Button>
      </span>
    </nav>
  );
}
