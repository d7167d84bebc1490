import { useEffect, useState } from 'react';
import { Link } from 'react-router-dom';
import { Square, Timer } from 'lucide-react';
import type { BenchSummary, PlannedStage } from '../../../../shared/schemas/dashboard';
import { Button, ButtonLink } from '../../../components/ui/button';
import { Card } from '../../../components/ui/card';
import { ErrorNote } from '../../../components/ui/error-note';
import { useToast } from '../../../components/ui/toast';
import { useStopTimer } from '../api/stop-timer';
import { clock, formatDay, hoursText, shortDay } from './dates';

function elapsed(since: string, now: number): string {
  const m = Math.max(0, Math.floor((now - Date.parse(since)) / 60_000));
  return m < 60 ? `${m} min` : `${Math.floor(m / 60)} h ${String(m % 60).padStart(2, '0')} min`;
}

function RunningTimer({ studioId, bench }: { studioId: number; bench: BenchSummary }) {
  const t = bench.timer!;
  const [now, setNow] = useState(() => Date.now());
  useEffect(() => {
    const id = window.setInterval(() => setNow(Date.now()), 30_000);
    return () => window.clearInterval(id);
  }, []);
  const stop = useStopTimer(studioId);
  const toast = useToast();
  return (
    <div className="flex flex-wrap items-center gap-3 rounded-card border-2 border-verdigris-600 bg-verdigris-100 p-3">
      <Timer aria-hidden="true" className="size-5 text-verdigris-600" />
      <div className="min-w-0 flex-1">
        <p className="font-semibold">
          Timer running: {t.stage.name} on <Link to={`/studio/${studioId}/commissions/${t.commission.id}`}>{t.figure.name}</Link>
        </p>
        <p className="text-sm text-sable-600">
          {t.commission.title} · since {clock(t.startedAt, bench.timeZone)} · <span className="figures">{elapsed(t.startedAt, now)}</span>
        </p>
      </div>
      <Button variant="secondary" onClick={() => stop.mutate(undefined, { onSuccess: () => toast.show(`Timer stopped; the time is logged on ${t.stage.name}.`) })} loading={stop.isPending}>
        <Square aria-hidden="true" className="size-4" />
        Stop the timer
      </Button>
      {stop.error && <ErrorNote className="w-full">{stop.error.message}</ErrorNote>}
    </div>
  );
}

function StageList({ studioId, stages, timeZone, empty, showDay }: { studioId: number; stages: PlannedStage[]; timeZone: string; empty: string; showDay?: boolean }) {
  if (stages.length === 0) return <p className="text-sm text-sable-600">{empty}</p>;
  return (
    <ul className="flex flex-col divide-y divide-primer-300">
      {stages.map((s) => (
        <li key={s.stageId} className="py-2">
          <p>
            <span className="font-medium">{s.stageName}</span> ·{' '}
            <Link to={`/studio/${studioId}/commissions/${s.commission.id}`}>
              {s.figure.name}
              {s.figure.quantity > 1 ? ` ×${s.figure.quantity}` : ''}
            </Link>
          </p>
          <p className="text-xs text-sable-600">
            {s.commission.title}
            {s.commission.dueDate ? ` · due ${formatDay(s.commission.dueDate)}` : ''}
          </p>
          <p className="figures text-sm">
            {when(s, timeZone, showDay)} · {hoursText(s.hours)}
          </p>
        </li>
      ))}
    </ul>
  );
}

/** "09:00–15:00", or across days "Wed, 2 Dec 09:00 to Fri, 4 Dec 15:00". */
function when(s: PlannedStage, timeZone: string, showDay = false): string {
  const a = localDate(s.start, timeZone);
  const b = localDate(s.end, timeZone);
  if (a !== b) return `${shortDay(a)} ${clock(s.start, timeZone)} to ${shortDay(b)} ${clock(s.end, timeZone)}`;
  return `${showDay ? `${shortDay(a)} ` : ''}${clock(s.start, timeZone)}–${clock(s.end, timeZone)}`;
}

function localDate(instant: string, timeZone: string): string {
  try {
    return new Intl.DateTimeFormat('en-CA', { timeZone, year: 'numeric', month: '2-digit', day: '2-digit' }).format(new Date(instant));
  } catch {
    return instant.slice(0, 10);
  }
}

/** A person's bench as the forecast plans it: today, the rest of this ISO week, and the running timer. */
export function BenchSummaryCards({ studioId, bench, title = 'Your bench' }: { studioId: number; bench: BenchSummary; title?: string }) {
  // The rest of the week: what goes on after today (a stage begun today and finished later shows in both).
  const later = bench.weekStages.filter((s) => localDate(s.end, bench.timeZone) > bench.today);
  return (
    <section aria-label={title} className="flex flex-col gap-4">
      {bench.timer && <RunningTimer studioId={studioId} bench={bench} />}
      <div className="grid gap-4 lg:grid-cols-2">
        <Card title="Today" description={`${formatDay(bench.today)} · planned by the forecast`}>
          <StageList studioId={studioId} stages={bench.todayStages} timeZone={bench.timeZone} empty="Nothing planned for you today." />
        </Card>
        <Card
          title={`Later this week (W${String(bench.week.week).padStart(2, '0')})`}
          description={`${hoursText(bench.weekHours.planned)} planned of your ${hoursText(bench.weekHours.capacity)} still to come this week`}
          actions={
            <ButtonLink to="bench" variant="ghost" size="sm">
              Open the bench
            </ButtonLink>
          }
        >
          <StageList studioId={studioId} stages={later} timeZone={bench.timeZone} empty="Nothing more planned this week." showDay />
        </Card>
      </div>
    </section>
  );
}
