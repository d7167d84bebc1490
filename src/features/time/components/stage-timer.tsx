import { Play, Square } from 'lucide-react';
import { Button } from '../../../components/ui/button';
import { useToast } from '../../../components/ui/toast';
import { useStartTimer } from '../api/start-timer';
import { useStopTimer } from '../api/stop-timer';
import { useTimer } from '../api/get-timer';
import { useElapsed } from './elapsed';

/** Start or stop the person's timer on one stage; starting it here stops one running elsewhere. */
export function StageTimer({ studioId, stageId, stageName, figureName, size = 'sm', short = false }: { studioId: number; stageId: number; stageName: string; figureName: string; size?: 'sm' | 'md'; short?: boolean }) {
  const timer = useTimer(studioId);
  const start = useStartTimer(studioId);
  const stop = useStopTimer(studioId);
  const toast = useToast();
  const running = timer.data?.running;
  const here = running?.stageId === stageId;
  const elapsed = useElapsed(here ? running?.startedAt : null);

  if (here) {
    return (
      <Button
        variant="secondary"
        size={size}
        loading={stop.isPending}
        aria-label={`Stop the timer on ${stageName} of ${figureName}`}
        onClick={async () => {
          try {
            const e = await stop.mutateAsync();
            toast.show(`Timer stopped: ${e.hours ?? 0} h on ${stageName}.`);
          } catch (err) {
            toast.show(err instanceof Error ? err.message : 'The timer did not stop. Try again.', 'error');
          }
        }}
      >
        <Square aria-hidden="true" className="size-4 fill-current" />
        Stop <span className="figures">{elapsed}</span>
      </Button>
    );
  }
  return (
    <Button
      variant="ghost"
      size={size}
      loading={start.isPending}
      aria-label={`Start the timer on ${stageName} of ${figureName}`}
      onClick={async () => {
        try {
          await start.mutateAsync(stageId);
          toast.show(running ? `Timer moved to ${stageName}; the one on ${running.stage.name} is stopped.` : `Timer running on ${stageName}.`);
        } catch (err) {
          toast.show(err instanceof Error ? err.message : 'The timer did not start. Try again.', 'error');
        }
      }}
    >
      <Play aria-hidden="true" className="size-4" />
      {short ? 'Timer' : 'Start timer'}
    </Button>
  );
}
