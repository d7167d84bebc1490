import { isRouteErrorResponse, useRouteError } from 'react-router-dom';
import { ErrorNote } from '../components/ui/error-note';
import { Button } from '../components/ui/button';
import { useDocumentTitle } from '../components/ui/page-title';
import { NotFoundScreen } from './routes/not-found';

/** Last line of defence when a screen throws or its code cannot be loaded (often after an update). */
export function RouteError() {
  const error = useRouteError();
  useDocumentTitle('Something went wrong');
  if (isRouteErrorResponse(error) && error.status === 404) return <NotFoundScreen />;
  if (import.meta.env.DEV) console.error(error);
  return (
    <div className="mx-auto max-w-md px-4 py-12">
      <ErrorNote
        title="This screen stopped working"
        action={
          <Button variant="secondary" size="sm" onClick={() => window.location.reload()}>
            Reload the page
          </Button>
        }
      >
        Something broke while showing it. Reloading usually sorts it out; your saved work is safe.
      </ErrorNote>
    </div>
  );
}
