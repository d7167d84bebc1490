import { Link } from 'react-router-dom';
import { PageTitle } from '../../components/ui/page-title';

/** An unknown address inside a studio: keep the rail, say so, offer the way home. */
export default function StudioNotFoundPage() {
  return (
    <>
      <PageTitle title="Page not found" />
      <p className="text-sm text-sable-600">
        Nothing lives at this address in the studio. The link may be old or mistyped. <Link to="..">Back to the studio home</Link>
      </p>
    </>
  );
}
