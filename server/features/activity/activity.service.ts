import { commissionStatusLabels, isCommissionStatus, stageStatusLabels, type StageStatus } from '../../../shared/commission-lifecycle';
import type { ActivityEntry } from '../../../shared/schemas/commissions';
import { iso, type Clock } from '../../lib/clock';
import type { Db } from '../../lib/db';
import type { Page, PageParams } from '../../../shared/schemas/common';
import { errors } from '../../lib/errors';
import { pageOf } from '../../lib/page';
import type { Member } from '../../lib/policy';
import { keptAtVersion } from '../../lib/version-cache';
import type { ActivityRepository, ActivityRow } from './activity.repository';

export type ActivityInput = { studioId: number; commissionId: number; userId: number | null; action: string; detail?: Record<string, unknown> };

const fieldNames: Record<string, string> = {
  title: 'the title',
  brief: 'the brief',
  dueDate: 'the due date',
  priority: 'the priority',
  name: 'the name',
  quantity: 'the quantity',
  sizeClass: 'the size',
  footprint: 'the footprint',
  tier: 'the tier',
  extras: 'the extras',
  subAssemblies: 'the sub-assemblies',
  lightSource: 'the light source',
  painterId: 'the painter',
  estimateHours: 'the estimate',
  waitHours: 'the wait',
  hours: 'the hours',
  note: 'the note',
};

const str = (v: unknown) => (typeof v === 'string' ? v : v === null || v === undefined ? '' : String(v));
const quoted = (v: unknown) => `“${str(v)}”`;

function fieldList(changes: unknown): string {
  const names = Object.keys((changes as Record<string, unknown>) ?? {}).map((k) => fieldNames[k] ?? k);
  if (!names.length) return 'nothing';
  return names.length === 1 ? names[0] : `${names.slice(0, -1).join(', ')} and ${names[names.length - 1]}`;
}

function fromTo(changes: unknown, field: string, unit = ''): string {
  const c = (changes as Record<string, { from: unknown; to: unknown }> | undefined)?.[field];
  return c ? ` (${str(c.from) || '—'}${unit} → ${str(c.to) || '—'}${unit})` : '';
}

/** A readable sentence for an activity entry; unknown actions (other features) may carry `detail.summary`. */
export function summarize(action: string, d: Record<string, unknown>, who: string): string {
  const on = d.stageName ? `${str(d.stageName)} of ${quoted(d.figureName)}` : quoted(d.figureName);
  switch (action) {
    case 'commission.created':
      return `${who} created the commission ${quoted(d.title)}.`;
    case 'commission.updated':
      return `${who} changed ${fieldList(d.changes)}${fromTo(d.changes, 'dueDate')}.`;
    case 'commission.status': {
      const label = (s: unknown) => (typeof s === 'string' && isCommissionStatus(s) ? commissionStatusLabels[s] : str(s));
      return `${who} moved the commission from ${label(d.from)} to ${label(d.to)}${d.reason ? `: ${str(d.reason)}` : ''}.`;
    }
    case 'commission.scheme_notes':
      return `${who} updated the scheme notes.`;
    case 'figure.added':
      return `${who} added ${Number(d.quantity) > 1 ? `${str(d.quantity)} × ` : ''}${quoted(d.name)}.`;
    case 'figure.updated':
      return `${who} changed ${fieldList(d.changes)} of ${quoted(d.name)}${fromTo(d.changes, 'quantity')}.`;
    case 'figure.removed':
      return `${who} removed ${quoted(d.name)}.`;
    case 'stage.status': {
      const to = stageStatusLabels[d.to as StageStatus] ?? str(d.to);
      return d.to === 'done' ? `${who} marked ${on} done.` : `${who} set ${on} to ${to}.`;
    }
    case 'stage.updated':
      return `${who} changed ${fieldList(d.changes)} of ${on}${fromTo(d.changes, 'estimateHours', ' h')}${fromTo(d.changes, 'waitHours', ' h')}.`;
    case 'time.added':
      return `${who} logged ${str(d.hours)} h on ${on}${d.source === 'timer' ? ' with the timer' : ''}.`;
    case 'time.updated':
      return `${who} edited a time entry on ${on}${fromTo(d.changes, 'hours', ' h')}.`;
    case 'time.deleted':
      return `${who} deleted a time entry of ${str(d.hours)} h on ${on}.`;
    // Written by the photos, comments and approvals features.
    case 'photo.added': {
      const n = Array.isArray(d.photoIds) ? d.photoIds.length : 1;
      return `${who} added ${n === 1 ? 'a' : n} ${str(d.kind) || 'progress'} photo${n === 1 ? '' : 's'}${d.shared ? ', shared with the client' : ''}.`;
    }
    case 'photo.shared':
      return `${who} shared a photo with the client.`;
    case 'photo.unshared':
      return `${who} stopped sharing a photo with the client.`;
    case 'photo.deleted':
      return `${who} deleted a photo.`;
    case 'comment.added':
      return `${who} wrote a comment.`;
    case 'approval.requested':
      return `${who} asked the client to approve the ${subjectWords(d.subject)}.`;
    case 'approval.approved':
      return `${who} approved the ${subjectWords(d.subject)}.`;
    case 'approval.changes_requested':
    case 'approval.changes':
      return `${who} asked for changes to the ${subjectWords(d.subject)}.`;
    default:
      return typeof d.summary === 'string' ? `${who} ${d.summary}` : `${who}: ${action.replace(/[._]/g, ' ')}.`;
  }
}

/** Entries the kept activity pages may hold across commissions and queries. */
export const ACTIVITY_LIST_CACHE_ROWS = 20_000;

/**
 * A commission's log. Its pages are kept per commission, thread version and page (`cacheRows` entries at
 * most; 0 turns it off); who may see the commission is checked on every request, in the read that gives the version.
 */
export function activityService(deps: { repo: ActivityRepository; clock: Clock; cacheRows?: number }) {
  const { repo, clock } = deps;
  const kept = keptAtVersion<Page<ActivityEntry>>({ maxWeight: deps.cacheRows ?? ACTIVITY_LIST_CACHE_ROWS, weigh: (p) => p.items.length + 1 });
  const view = (r: ActivityRow): ActivityEntry => {
    let detail: Record<string, unknown>;
    try {
      detail = JSON.parse(r.detail) ?? {};
    } catch {
      detail = {};
    }
    return {
      id: r.id,
      at: r.at,
      user: r.user_id !== null && r.user_name !== null ? { id: r.user_id, name: r.user_name } : null,
      action: r.action,
      detail,
      summary: summarize(r.action, detail, r.user_name ?? 'Someone'),
    };
  };
  return {
    /** Records a change inside the transaction that makes it. */
    record: (trx: Db, e: ActivityInput) =>
      repo.insert(trx, { studioId: e.studioId, commissionId: e.commissionId, userId: e.userId, action: e.action, detail: e.detail ?? {}, at: iso(clock.now()) }),
    /**
     * One page of a commission's log, newest first, if the member may see the commission: the studio's team
     * sees all, a client only their own (else 404, as the commission's own answers).
     */
    async listFor(m: Member, commissionId: number, q: PageParams) {
      const t = await repo.thread(m.studioId, commissionId);
      if (!t || (m.role === 'client' && t.client_id !== m.clientId)) throw errors.notFound('That commission');
      return kept(commissionId, Number(t.thread_version), `${q.limit} ${q.offset}`, async () => {
        const { rows, total } = await repo.list(m.studioId, commissionId, q);
        return pageOf(rows.map(view), total, q);
      });
    },
  };
}

export type ActivityService = ReturnType<typeof activityService>;

/** How an approval's subject reads in a sentence: "the colour scheme", "the test figure", "the finished work". */
function subjectWords(subject: unknown): string {
  const words: Record<string, string> = { scheme: 'colour scheme', 'test-figure': 'test figure', finished: 'finished work' };
  return words[String(subject)] ?? 'work';
}
