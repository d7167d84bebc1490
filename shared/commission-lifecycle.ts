// The commission lifecycle, stage statuses and progress: pure rules shared by the API and the client.

export const commissionStatuses = ['enquiry', 'quoted', 'booked', 'on_bench', 'ready_to_ship', 'shipped', 'closed', 'on_hold', 'cancelled'] as const;
export type CommissionStatus = (typeof commissionStatuses)[number];

export const commissionStatusLabels: Record<CommissionStatus, string> = {
  enquiry: 'Enquiry',
  quoted: 'Quoted',
  booked: 'Booked',
  on_bench: 'On the bench',
  ready_to_ship: 'Ready to ship',
  shipped: 'Shipped',
  closed: 'Closed',
  on_hold: 'On hold',
  cancelled: 'Cancelled',
};

export const isCommissionStatus = (s: string): s is CommissionStatus => (commissionStatuses as readonly string[]).includes(s);

/** Moves from every status except on hold, whose way out depends on where it came from. */
const moves: Record<Exclude<CommissionStatus, 'on_hold'>, CommissionStatus[]> = {
  enquiry: ['quoted', 'cancelled', 'on_hold'],
  quoted: ['booked', 'enquiry', 'cancelled', 'on_hold'],
  booked: ['on_bench', 'cancelled', 'on_hold'],
  on_bench: ['ready_to_ship', 'cancelled', 'on_hold'],
  ready_to_ship: ['shipped', 'on_bench', 'on_hold'],
  shipped: ['closed'],
  closed: [],
  cancelled: [],
};

/**
 * Where a commission may go next. On hold goes back to the status it was put on hold from, or is
 * cancelled; `previous` is that status (stored when it went on hold).
 */
export function allowedTransitions(status: CommissionStatus, previous?: CommissionStatus | null): CommissionStatus[] {
  if (status === 'on_hold') {
    return previous && previous !== 'on_hold' && previous !== 'cancelled' ? [previous, 'cancelled'] : ['cancelled'];
  }
  return [...moves[status]];
}

export const canTransition = (from: CommissionStatus, to: CommissionStatus, previous?: CommissionStatus | null) =>
  allowedTransitions(from, previous).includes(to);

/** "On the bench, Cancelled or On hold" */
export function listLabels(statuses: CommissionStatus[]): string {
  const l = statuses.map((s) => commissionStatusLabels[s]);
  if (l.length <= 1) return l.join('');
  return `${l.slice(0, -1).join(', ')} or ${l[l.length - 1]}`;
}

/** The sentence a refused move answers with. */
export function refusedTransitionMessage(from: CommissionStatus, to: CommissionStatus, previous?: CommissionStatus | null): string {
  const allowed = allowedTransitions(from, previous);
  const head = `A commission that is ${commissionStatusLabels[from]} cannot move to ${commissionStatusLabels[to]}.`;
  return allowed.length ? `${head} It can move to ${listLabels(allowed)}.` : `${head} ${commissionStatusLabels[from]} is final.`;
}

/** Statuses in which figures, stages and time can no longer change. */
export const lockedStatuses: CommissionStatus[] = ['closed', 'cancelled'];

/** Statuses whose figures show on the bench board. */
export const boardStatuses: CommissionStatus[] = ['booked', 'on_bench'];

// --- stages -------------------------------------------------------------------------------------

export const stageStatuses = ['todo', 'working', 'done', 'skipped'] as const;
export type StageStatus = (typeof stageStatuses)[number];
export const stageStatusLabels: Record<StageStatus, string> = { todo: 'To do', working: 'Working', done: 'Done', skipped: 'Skipped' };

export const priorities = ['low', 'normal', 'high'] as const;
export type Priority = (typeof priorities)[number];
export const priorityLabels: Record<Priority, string> = { low: 'Low', normal: 'Normal', high: 'High' };

/** The stage being worked: the first (by position) that is neither done nor skipped; null when none is left. */
export function currentStage<T extends { status: StageStatus; position: number }>(stages: T[]): T | null {
  return [...stages].sort((a, b) => a.position - b.position).find((s) => s.status === 'todo' || s.status === 'working') ?? null;
}

/** The end of the wait after a done stage (drying, curing), or null when it has none. */
export function waitUntil(doneAt: string | null, waitMinutes: number): string | null {
  if (!doneAt || waitMinutes <= 0) return null;
  return new Date(new Date(doneAt).getTime() + waitMinutes * 60_000).toISOString();
}

// --- hours and progress ---------------------------------------------------------------------------

/** The database keeps whole minutes; the API speaks hours with two decimals. */
export const minutesToHours = (m: number) => Math.round((m / 60) * 100) / 100;
export const hoursToMinutes = (h: number) => Math.round(h * 60);

export type Progress = { stagesDone: number; stagesTotal: number; hoursDone: number; hoursTotal: number; share: number };

export type ProgressTotals = {
  /** all stages, skipped ones included */
  stages: number;
  skipped: number;
  done: number;
  /** estimated minutes of the stages that are not skipped */
  minutesTotal: number;
  /** estimated minutes of the done stages */
  minutesDone: number;
};

/**
 * Progress is the share of estimated hours done. A skipped stage leaves the total (it will not be worked,
 * so it neither counts as done nor holds the bar back). When no hours are estimated the share falls back
 * to the count of stages; a figure whose every stage was skipped is complete (1); one without stages is 0.
 */
export function progressFromTotals(t: ProgressTotals): Progress {
  const stagesTotal = t.stages - t.skipped;
  let share: number;
  if (t.minutesTotal > 0) share = t.minutesDone / t.minutesTotal;
  else if (stagesTotal > 0) share = t.done / stagesTotal;
  else share = t.stages > 0 ? 1 : 0;
  return {
    stagesDone: t.done,
    stagesTotal,
    hoursDone: minutesToHours(t.minutesDone),
    hoursTotal: minutesToHours(t.minutesTotal),
    share: Math.round(share * 1000) / 1000,
  };
}

export function totalsOf(stages: { status: StageStatus; estimateMinutes: number }[]): ProgressTotals {
  const t: ProgressTotals = { stages: stages.length, skipped: 0, done: 0, minutesTotal: 0, minutesDone: 0 };
  for (const s of stages) {
    if (s.status === 'skipped') {
      t.skipped++;
      continue;
    }
    t.minutesTotal += s.estimateMinutes;
    if (s.status === 'done') {
      t.done++;
      t.minutesDone += s.estimateMinutes;
    }
  }
  return t;
}

export const progressOf = (stages: { status: StageStatus; estimateMinutes: number }[]) => progressFromTotals(totalsOf(stages));

export function addTotals(a: ProgressTotals, b: ProgressTotals): ProgressTotals {
  return {
    stages: a.stages + b.stages,
    skipped: a.skipped + b.skipped,
    done: a.done + b.done,
    minutesTotal: a.minutesTotal + b.minutesTotal,
    minutesDone: a.minutesDone + b.minutesDone,
  };
}

export const emptyTotals = (): ProgressTotals => ({ stages: 0, skipped: 0, done: 0, minutesTotal: 0, minutesDone: 0 });

/**
 * The estimated minutes of each stage of a new figure. Until a quote is accepted, the template's default
 * minutes times the quantity; `perStage` (whole-batch minutes by stage key, e.g. from an accepted quote)
 * replaces them stage by stage.
 */
export function stageEstimates(
  template: { key: string; defaultMinutes: number }[],
  quantity: number,
  perStage?: Partial<Record<string, number>>,
): Record<string, number> {
  const out: Record<string, number> = {};
  for (const s of template) out[s.key] = Math.max(0, Math.round(perStage?.[s.key] ?? s.defaultMinutes * quantity));
  return out;
}
