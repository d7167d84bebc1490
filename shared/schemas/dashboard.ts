// The home pages: what each role needs to see today. Responses only (the dashboard takes no input).
import type { CommissionStatus } from '../commission-lifecycle';

export type UtilisationWeek = {
  year: number;
  week: number;
  label: string;
  start: string;
  /** working hours of all painters in the week (from now on, for the current week), days off and closed days left out */
  capacityHours: number;
  /** hours the forecast books in that week */
  bookedHours: number;
  /** booked / capacity, 0 when there is no capacity */
  share: number;
};

export type OverdueStage = {
  stageId: number;
  stageName: string;
  figure: { id: number; name: string };
  commission: { id: number; title: string; dueDate: string };
  painter: { id: number; name: string } | null;
  daysOverdue: number;
};

export type UnpaidInvoice = {
  id: number;
  number: string | null;
  kind: string;
  currency: string;
  due: number;
  dueDate: string | null;
  overdue: boolean;
  clientName: string;
  commission: { id: number; title: string };
};

export type AtRiskCommission = {
  id: number;
  title: string;
  client: { id: number; name: string };
  dueDate: string;
  finishDate: string | null;
  slackDays: number | null;
  late: boolean;
  unscheduled: boolean;
};

export type OwnerDashboard = {
  role: 'owner';
  today: string;
  timeZone: string;
  currency: string;
  byStatus: { status: CommissionStatus; count: number }[];
  utilisation: UtilisationWeek[];
  overdueStages: { total: number; items: OverdueStage[] };
  invoices: {
    unpaid: { count: number; amount: number };
    overdue: { count: number; amount: number };
    items: UnpaidInvoice[];
  };
  revenue: { month: string; paid: number; net: number }[];
  atRisk: AtRiskCommission[];
  /** the owner's own bench, when they paint too (work planned for them or a timer running) */
  myBench: BenchSummary | null;
};

export type PlannedStage = {
  stageId: number;
  stageName: string;
  figure: { id: number; name: string; quantity: number };
  commission: { id: number; title: string; dueDate: string | null };
  /** hours the forecast puts on this stage in the period */
  hours: number;
  start: string;
  end: string;
};

export type PainterTimer = {
  entryId: number;
  startedAt: string;
  stage: { id: number; name: string };
  figure: { id: number; name: string };
  commission: { id: number; title: string };
};

export type BenchSummary = {
  today: string;
  timeZone: string;
  week: { year: number; week: number; start: string; end: string };
  todayStages: PlannedStage[];
  weekStages: PlannedStage[];
  /** my working hours this week (from now on) and the hours planned for me in them */
  weekHours: { capacity: number; planned: number };
  timer: PainterTimer | null;
};

export type PainterDashboard = BenchSummary & { role: 'painter' };

export type ClientCommission = {
  id: number;
  title: string;
  status: CommissionStatus;
  dueDate: string | null;
  /** projected ready-to-ship date for booked and on-the-bench commissions */
  projectedDate: string | null;
  late: boolean;
};

export type ClientDashboard = { role: 'client'; today: string; timeZone: string; commissions: ClientCommission[] };

export type Dashboard = OwnerDashboard | PainterDashboard | ClientDashboard;
