import { Button } from '../../../components/ui/button';
import { ErrorNote } from '../../../components/ui/error-note';
import { PageTitle } from '../../../components/ui/page-title';
import { LoadingBlock } from '../../../components/ui/spinner';
import { useStudioScope } from '../../../lib/studio-scope';
import { usePriceTable } from '../api/get-price-table';
import { PriceTableForm } from '../components/price-table-form';

export function PriceTableRoute() {
  const { studioId } = useStudioScope();
  const table = usePriceTable(studioId);
  return (
    <>
      <PageTitle title="Prices" description="Set these once: every quote prices itself from them. Quotes already sent keep the prices they were made with." />
      {table.isPending ? (
        <LoadingBlock label="Loading prices…" />
      ) : table.error ? (
        <ErrorNote
          title="The prices did not load"
          action={
            <Button variant="secondary" size="sm" onClick={() => table.refetch()}>
              Try again
            </Button>
          }
        >
          {table.error.message}
        </ErrorNote>
      ) : (
        <PriceTableForm table={table.data} />
      )}
    </>
  );
}
