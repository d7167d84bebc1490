import type { ReactNode } from 'react';
import { BrandLink } from './brand';

/** The frame for screens before sign-in: our mark, one card, a short line underneath. */
export function AuthShell({ children, aside }: { children: ReactNode; aside?: ReactNode }) {
  return (
    <div className="flex min-h-dvh flex-col items-center px-4 py-8 sm:py-12">
      <header className="mb-6">
        <BrandLink />
      </header>
      <main id="main" className="w-full max-w-md">
        <div className="rounded-card border border-primer-300 bg-bone-50 p-5 shadow-raised sm:p-8">{children}</div>
        {aside && <div className="mt-6 flex flex-col gap-4">{aside}</div>}
      </main>
      <footer className="mt-auto pt-10 text-center text-xs text-sable-600">Sablework · for studios that paint to order</footer>
    </div>
  );
}
