import { Link } from 'react-router-dom';
import { Square, Timer } from 'lucide-react';
import { Button } from '../../../components/ui/button';
import { useToast } from '../../../components/ui/toast';
import { useTimer } from '../api/get-timer';
import { useStopTimer } from '../api/stop-timer';
import { useElapsed } from './elapsed';

/** In the header for owners and painters: what the timer runs on, how long, and a stop button. */
export function RunningTimer({ studioId }: { studioId: number }) {
  const timer = useTimer(studioId);
  const stop = useStopTimer(studioId);
  const toast = useToast();
  const running = timer.data?.running ?? null;
  const elapsed = useElapsed(running?.startedAt);
  if (!running) return null;
  return (
    <div role="group" aria-label="Running timer" className="flex items-center gap-2 rounded-control border border-verdigris-600 bg-verdigris-100 py-1 pr-1 pl-2 text-sm">
      <Timer aria-hidden="true" className="size-4 shrink-0 text-verdigris-600" />
      <Link
        to={`/studio/${studioId}/commissions/${running.commission.id}`}
        className="hidden max-w-56 truncate text-sable-900 no-underline hover:underline md:inline"
        title={`${running.stage.name} · ${running.figure.name} · ${running.commission.title}`}
      >
        {running.stage.name} · {running.figure.name}
      </Link>
      <span className="figures font-semibold">{elapsed}</span>
      <Button
        variant="secondary"
        size="sm"
        loading={stop.isPending}
        aria-label={`Stop the timer on ${running.stage.name} of ${running.figure.name}`}
        onClick={async () => {
          try {
            const e = await stop.mutateAsync();
            toast.show(`Timer stopped: ${e.hours ?? 0} h on ${running.stage.name}.`);
          } catch (err) {
            toast.show(err instanceof Error ? err.message : 'The timer did not stop. Try again.', 'error');
          }
        }}
      >
        <Square aria-hidden="true" className="size-3.5 fill-current" />
        Stop
      </Button>
    </div>
  );
}
