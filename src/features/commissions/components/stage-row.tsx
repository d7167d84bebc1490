import { useState, type ReactNode } from 'react';
import { ChevronDown, Clock, Hourglass, TriangleAlert } from 'lucide-react';
import { stageStatuses, stageStatusLabels } from '../../../../shared/commission-lifecycle';
import type { Hazard, Stage } from '../../../../shared/schemas/commissions';
import { Badge } from '../../../components/ui/badge';
import { useToast } from '../../../components/ui/toast';
import { cn } from '../../../lib/cn';
import { formatDateTime } from '../../../lib/format';
import { useNow } from '../../../lib/use-now';
import { useUpdateStage } from '../api/update-stage';
import { SafetyNote } from './safety-note';

const h = (n: number) => new Intl.NumberFormat(undefined, { maximumFractionDigits: 2 }).format(n);

export function StageRow({
  studioId,
  stage,
  current,
  locked,
  hazards,
  timezone,
  timer,
  timeLog,
}: {
  studioId: number;
  stage: Stage;
  current: boolean;
  locked: boolean;
  hazards: Hazard[] | undefined;
  timezone: string;
  /** Start/stop for this stage, from the time feature; always in view. */
  timer?: ReactNode;
  /** The stage's time entries, from the time feature; opened on request. */
  timeLog?: ReactNode;
}) {
  const update = useUpdateStage(studioId);
  const toast = useToast();
  const [estimate, setEstimate] = useState(String(stage.estimateHours));
  const [openTime, setOpenTime] = useState(false);
  // The stage being worked shows its caution open; others on request.
  const [showSafety, setShowSafety] = useState(current);
  const [shownEstimate, setShownEstimate] = useState(stage.estimateHours);
  if (shownEstimate !== stage.estimateHours) {
    setShownEstimate(stage.estimateHours);
    setEstimate(String(stage.estimateHours));
  }
  const now = useNow();
  const waiting = stage.waitUntil && Date.parse(stage.waitUntil) > now;

  async function save(input: Parameters<typeof update.mutateAsync>[0]) {
    try {
      await update.mutateAsync(input);
    } catch (err) {
      toast.show(err instanceof Error ? err.message : 'That did not save. Try again.', 'error');
      setEstimate(String(stage.estimateHours));
    }
  }

  function saveEstimate() {
    const n = Number(estimate.replace(',', '.'));
    if (estimate.trim() === '' || !Number.isFinite(n) || n < 0) {
      setEstimate(String(stage.estimateHours));
      toast.show('Enter the estimate as hours, such as 1.5.', 'error');
      return;
    }
    if (n !== stage.estimateHours) void save({ stageId: stage.id, estimateHours: n });
  }

  const statusId = `stage-${stage.id}-status`;
  const estimateId = `stage-${stage.id}-estimate`;
  const toggle = 'inline-flex min-h-8 items-center gap-1 rounded-control px-1 text-sm text-verdigris-600 hover:bg-verdigris-100';
  return (
    <li className={cn('flex flex-col gap-1 py-2', current && '-mx-2 rounded-control bg-verdigris-100 px-2')}>
      <div className="flex flex-wrap items-center gap-x-4 gap-y-2">
        <div className="flex min-w-40 flex-1 flex-wrap items-center gap-2">
          <span className={cn('font-medium', stage.status === 'skipped' && 'text-sable-600 line-through')}>{stage.name}</span>
          {current && <Badge tone="success">Now</Badge>}
          {waiting && (
            <Badge tone="attention">
              <Hourglass aria-hidden="true" className="size-3" />
              Drying until {formatDateTime(stage.waitUntil!, timezone)}
            </Badge>
          )}
        </div>
        <div className="flex flex-wrap items-center gap-3">
          <label htmlFor={statusId} className="sr-only">
            Status of {stage.name}
          </label>
          <select
            id={statusId}
            value={stage.status}
            disabled={locked || update.isPending}
            onChange={(e) => void save({ stageId: stage.id, status: e.target.value as Stage['status'] })}
            className="min-h-8 w-28 rounded-control border border-sable-600 bg-white px-2 text-sm"
          >
            {stageStatuses.map((s) => (
              <option key={s} value={s}>
                {stageStatusLabels[s]}
              </option>
            ))}
          </select>
          <span className="inline-flex items-center gap-1 text-sm">
            <label htmlFor={estimateId} className="text-sable-600">
              <span className="sr-only">Estimate for {stage.name}, in hours</span>
              <span aria-hidden="true">Est.</span>
            </label>
            <input
              id={estimateId}
              type="number"
              inputMode="decimal"
              min={0}
              step={0.25}
              value={estimate}
              disabled={locked}
              onChange={(e) => setEstimate(e.target.value)}
              onBlur={saveEstimate}
              onKeyDown={(e) => {
                if (e.key === 'Enter') {
                  e.preventDefault();
                  saveEstimate();
                }
              }}
              className="figures min-h-8 w-20 rounded-control border border-sable-600 bg-white px-2 text-sm"
            />
            <span aria-hidden="true">h</span>
          </span>
          {stage.loggedHours !== null && <span className="figures text-sm text-sable-600 sm:w-24 sm:text-right">{h(stage.loggedHours)} h logged</span>}
        </div>
      </div>
      <div className="flex flex-wrap items-center gap-x-3 gap-y-1 text-xs text-sable-600">
        {stage.doneBy && stage.doneAt && (
          <span>
            {stage.status === 'done' ? 'Done' : 'Last done'} by {stage.doneBy.name}, {formatDateTime(stage.doneAt, timezone)}
          </span>
        )}
        {stage.waitHours > 0 && stage.status !== 'done' && <span>Then {h(stage.waitHours)} h to dry</span>}
        {stage.hazards.length > 0 && (
          <button type="button" aria-expanded={showSafety} onClick={() => setShowSafety((o) => !o)} className={toggle}>
            <TriangleAlert aria-hidden="true" className="size-4" />
            Safety for {stage.name}
            <ChevronDown aria-hidden="true" className={cn('size-4 transition-transform', showSafety && 'rotate-180')} />
          </button>
        )}
        {timer}
        {timeLog && (
          <button type="button" aria-expanded={openTime} onClick={() => setOpenTime((o) => !o)} className={toggle}>
            <Clock aria-hidden="true" className="size-4" />
            Time on {stage.name}
            <ChevronDown aria-hidden="true" className={cn('size-4 transition-transform', openTime && 'rotate-180')} />
          </button>
        )}
      </div>
      {showSafety && <SafetyNote keys={stage.hazards} hazards={hazards} className="mt-1" />}
      {openTime && <div className="mt-1">{timeLog}</div>}
    </li>
  );
}
