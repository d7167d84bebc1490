import { useState } from 'react';
import { Card } from '../../../components/ui/card';
import { TextField } from '../../../components/ui/field';
import { EarliestDelivery } from './earliest-delivery';

/** The owner's quick answer to "when could you have it?": some hours of work placed at the end of the queue now. */
export function BookedTodayCard({ studioId }: { studioId: number }) {
  const [hours, setHours] = useState('12');
  const [wait, setWait] = useState('24');
  const h = Number(hours.replace(',', '.'));
  const w = Number(wait.replace(',', '.'));
  const okH = Number.isFinite(h) && h >= 0.05 && h <= 10_000;
  const okW = Number.isFinite(w) && w >= 0 && w <= 720;
  return (
    <Card title="If booked today" description="When new work could be ready if it joined the end of the queue now. Quotes show the same for their own figures.">
      <div className="flex flex-col gap-3">
        <div className="flex flex-wrap gap-3">
          <TextField id="bt-hours" label="Hours of bench work" inputMode="decimal" value={hours} onChange={(e) => setHours(e.target.value)} className="w-48" error={okH ? undefined : 'Enter hours from 0.05 to 10000.'} />
          <TextField id="bt-wait" label="Curing after the last stage (hours)" inputMode="decimal" value={wait} onChange={(e) => setWait(e.target.value)} className="w-64" error={okW ? undefined : 'Enter 0 to 720 hours.'} />
        </div>
        {okH && okW && <EarliestDelivery studioId={studioId} hours={h} waitHours={w} />}
      </div>
    </Card>
  );
}
