import { useSearchParams } from 'react-router-dom';
import { ErrorNote } from '../../../components/ui/error-note';
import { PageTitle } from '../../../components/ui/page-title';
import { LoadingBlock } from '../../../components/ui/spinner';
import { useStudioScope } from '../../../lib/studio-scope';
import { useActuals } from '../api/get-actuals';
import { useEarnings } from '../api/get-earnings';
import { ActualsSection } from '../components/actuals-section';
import { EarningsSection } from '../components/earnings-section';

const MONTH = /^\d{4}-(0[1-9]|1[0-2])$/;

/** The books: what the studio really earns, and what its logged time says about its prices. */
export function ReportsRoute() {
  const { studioId } = useStudioScope();
  const [params, setParams] = useSearchParams();
  const from = MONTH.test(params.get('from') ?? '') ? params.get('from')! : undefined;
  const to = MONTH.test(params.get('to') ?? '') ? params.get('to')! : undefined;
  const earnings = useEarnings(studioId, { from, to });
  const actuals = useActuals(studioId);

  return (
    <>
      <PageTitle title="The books" description="Earnings net of tax, fees and costs, and your logged hours against the estimates." />
      <div className="flex flex-col gap-6">
        {earnings.isPending ? (
          <LoadingBlock label="Adding up the earnings…" />
        ) : earnings.error ? (
          <ErrorNote title="The earnings did not load">{earnings.error.message}</ErrorNote>
        ) : (
          <EarningsSection
            studioId={studioId}
            report={earnings.data}
            from={earnings.data.from}
            to={earnings.data.to}
            onPeriod={(f, t) => setParams({ from: f, to: t }, { replace: true })}
          />
        )}
        {actuals.isPending ? (
          <LoadingBlock label="Comparing logged and estimated hours…" />
        ) : actuals.error ? (
          <ErrorNote title="The hours did not load">{actuals.error.message}</ErrorNote>
        ) : (
          <ActualsSection studioId={studioId} report={actuals.data} />
        )}
      </div>
    </>
  );
}
