import { Link } from 'react-router-dom';
import { Compass } from 'lucide-react';
import { BrandLink } from '../../components/layout/brand';
import { useDocumentTitle } from '../../components/ui/page-title';

/** Unknown address, or a studio the person is not part of (we do not say which). */
export function NotFoundScreen() {
  useDocumentTitle('Page not found');
  return (
    <div className="flex min-h-dvh flex-col items-center px-4 py-10">
      <BrandLink />
      <main id="main" className="mt-10 flex max-w-md flex-col items-center gap-3 text-center">
        <Compass aria-hidden="true" className="size-10 text-sable-600" />
        <h1 className="text-xl font-semibold">We could not find that page</h1>
        <p className="text-sm text-sable-600">
          The link may be old or mistyped, or the page belongs to a studio you are not part of. Check the address, or start again from your home page.
        </p>
        <Link to="/" className="mt-2 font-medium">
          Go to my home page
        </Link>
      </main>
    </div>
  );
}

export default NotFoundScreen;
