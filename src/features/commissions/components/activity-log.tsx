import { useState } from 'react';
import { Button } from '../../../components/ui/button';
import { ErrorNote } from '../../../components/ui/error-note';
import { LoadingBlock } from '../../../components/ui/spinner';
import { formatDateTime } from '../../../lib/format';
import { useActivity } from '../api/get-activity';

export function ActivityLog({ studioId, commissionId, timezone }: { studioId: number; commissionId: number; timezone: string }) {
  const activity = useActivity(studioId, commissionId);
  const [all, setAll] = useState(false);
  if (activity.isPending) return <LoadingBlock label="Loading the activity…" />;
  if (activity.error) return <ErrorNote>{activity.error.message}</ErrorNote>;
  if (activity.data.length === 0) return <p className="text-sm text-sable-600">Nothing has happened yet.</p>;
  const shown = all ? activity.data : activity.data.slice(0, 8);
  return (
    <div className="flex flex-col gap-3">
    <ol className="flex flex-col gap-2 text-sm">
      {shown.map((a) => (
        <li key={a.id} className="flex flex-col border-l-2 border-primer-300 pl-3 sm:flex-row sm:gap-3">
          <time dateTime={a.at} className="figures shrink-0 text-sable-600 sm:w-52">
            {formatDateTime(a.at, timezone)}
          </time>
          <span>{a.summary}</span>
        </li>
      ))}
    </ol>
      {activity.data.length > shown.length && (
        <div>
          <Button variant="secondary" size="sm" onClick={() => setAll(true)}>
            Show all {activity.data.length} entries
          </Button>
        </div>
      )}
    </div>
  );
}
