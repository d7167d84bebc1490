import { ArrowLeft } from 'lucide-react';
import { ButtonLink } from '../../../components/ui/button';
import { Card } from '../../../components/ui/card';
import { ErrorNote } from '../../../components/ui/error-note';
import { PageTitle } from '../../../components/ui/page-title';
import { LoadingBlock } from '../../../components/ui/spinner';
import { useStudioScope } from '../../../lib/studio-scope';
import { useCapacity } from '../api/get-capacity';
import { DaysOff } from '../components/days-off';
import { TimezoneForm } from '../components/timezone-form';
import { WeeklyHoursEditor } from '../components/weekly-hours-editor';

function todayIn(timeZone: string): string {
  try {
    return new Intl.DateTimeFormat('en-CA', { timeZone, year: 'numeric', month: '2-digit', day: '2-digit' }).format(new Date());
  } catch {
    return new Date().toISOString().slice(0, 10);
  }
}

/**
 * Capacity: each painter's hours per weekday, their days off and holidays, the studio's closed days and
 * timezone. Owners edit everyone's; a painter edits their own and sees the studio's closed days.
 */
export function CapacityRoute() {
  const { studioId, role, userId } = useStudioScope();
  const cap = useCapacity(studioId);
  const isOwner = role === 'owner';

  return (
    <>
      <PageTitle
        title="Working hours and days off"
        description={cap.data ? `Times are local to the studio (${cap.data.timeZone}). The forecast books work into these hours and skips the days off.` : undefined}
        actions={
          <ButtonLink to=".." relative="path" variant="ghost">
            <ArrowLeft aria-hidden="true" className="size-4" />
            Back to the calendar
          </ButtonLink>
        }
      />
      {cap.isPending ? (
        <LoadingBlock />
      ) : cap.error ? (
        <ErrorNote title="The working hours did not load">{cap.error.message}</ErrorNote>
      ) : (
        <div className="flex flex-col gap-6">
          {isOwner && (
            <Card title="Timezone">
              <TimezoneForm studioId={studioId} timezone={cap.data.timeZone} />
            </Card>
          )}
          {cap.data.painters
            .filter((p) => isOwner || p.userId === userId)
            .map((p) => (
              <Card key={p.userId} title={p.userId === userId ? `${p.name} (you)` : p.name} description={`${p.role === 'owner' ? 'Owner' : 'Painter'} · ${p.weeklyHours} h in an ordinary week`}>
                <div className="flex flex-col gap-6">
                  <section aria-label={`${p.name}’s week`}>
                    <h3 className="mb-2 text-base font-semibold">Hours each week</h3>
                    <WeeklyHoursEditor studioId={studioId} painter={p} editable={isOwner || p.userId === userId} />
                  </section>
                  <section aria-label={`${p.name}’s days off`}>
                    <h3 className="mb-2 text-base font-semibold">Days off and holidays</h3>
                    <DaysOff studioId={studioId} userId={p.userId} who={p.name} entries={p.daysOff} editable={isOwner || p.userId === userId} today={todayIn(cap.data.timeZone)} />
                  </section>
                </div>
              </Card>
            ))}
          <Card title="Studio closed" description="Public holidays and other days nobody works.">
            <DaysOff studioId={studioId} userId={null} who="the studio" entries={cap.data.closedDays} editable={isOwner} today={todayIn(cap.data.timeZone)} />
          </Card>
        </div>
      )}
    </>
  );
}
