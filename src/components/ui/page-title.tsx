import { useEffect, type ReactNode } from 'react';

export function useDocumentTitle(title: string) {
  useEffect(() => {
    document.title = title ? `${title} · Sablework` : 'Sablework';
  }, [title]);
}

/** The screen's heading; also names the browser tab "… · Sablework". */
export function PageTitle({ title, description, actions }: { title: string; description?: ReactNode; actions?: ReactNode }) {
  useDocumentTitle(title);
  return (
    <header className="mb-6 flex flex-wrap items-end justify-between gap-3">
      <div className="min-w-0">
        <h1 className="text-xl font-semibold break-words sm:text-2xl">{title}</h1>
        {description && <p className="mt-1 text-sm text-sable-600">{description}</p>}
      </div>
      {actions && <div className="flex flex-wrap gap-2">{actions}</div>}
    </header>
  );
}
