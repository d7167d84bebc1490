import type { ReactNode } from 'react';
import { get, type FieldErrors } from 'react-hook-form';
import type { PriceDraft } from './draft';

/** The message for one box, by its table path. */
export function errorAt(errors: FieldErrors<PriceDraft>, path: string): string | undefined {
  const e = get(errors, path) as { message?: unknown } | undefined;
  return typeof e?.message === 'string' ? e.message : undefined;
}

/** A labelled group of fields inside a card, for sections that need more than one line of explanation. */
export function Section({ id, title, description, children }: { id: string; title: string; description?: ReactNode; children: ReactNode }) {
  return (
    <section aria-labelledby={id} className="rounded-card border border-primer-300 bg-bone-50 p-4 shadow-raised sm:p-6">
      <h2 id={id} className="text-lg font-semibold">
        {title}
      </h2>
      {description && <div className="mt-1 max-w-prose text-sm text-sable-600">{description}</div>}
      <div className="mt-4">{children}</div>
    </section>
  );
}

/** A small inline problem under a list or a row. */
export function InlineError({ id, children }: { id?: string; children: ReactNode }) {
  return (
    <p id={id} className="text-sm text-oxide-600">
      {children}
    </p>
  );
}
