import { EnquiriesListRoute } from '../../features/enquiries/routes/enquiries-list';
import { PublicPageCard } from '../../features/public-studio/components/public-page-card';
import { useStudioScope } from '../../lib/studio-scope';

/** The inbox, with the public page's own card on top (the page is where enquiries come from). */
export default function EnquiriesPage() {
  const { studioId } = useStudioScope();
  return <EnquiriesListRoute settings={<PublicPageCard studioId={studioId} />} />;
}
