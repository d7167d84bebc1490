import { addDays, localDateOf } from '../../../shared/dates';
import { lockedStatuses, type CommissionStatus } from '../../../shared/commission-lifecycle';
import { formatMoney } from '../../../shared/money';
import { QuoteInputError, quoteFigures, type QuoteResult } from '../../../shared/pricing';
import type { Page } from '../../../shared/schemas/common';
import type { Figure } from '../../../shared/schemas/commissions';
import type { PriceTable, QuoteFigure } from '../../../shared/schemas/price-table';
import {
  type AcceptQuoteInput,
  type ClientQuoteResult,
  type CreateQuoteInput,
  type DeclineQuoteInput,
  type Quote,
  type QuoteInput,
  type QuoteListQuery,
  type ParsedQuotePreviewInput,
  type QuoteStatus,
  type QuoteSummary,
  type RequestQuoteChangesInput,
  type UpdateQuoteInput,
} from '../../../shared/schemas/quotes';
import { iso, type Clock } from '../../lib/clock';
import type { Db } from '../../lib/db';
import { errors } from '../../lib/errors';
import type { Mailer } from '../../lib/mail/mailer';
import { templates } from '../../lib/mail/templates';
import type { Member } from '../../lib/policy';
import type { ActivityService } from '../activity/activity.service';
import type { InvoicesService } from '../invoices/invoices.service';
import type { PriceTableService } from '../price-table/price-table.service';
import { keptReads, type VersionInZone } from '../../lib/version-cache';
import type { QuoteListRow, QuoteRow, QuotesRepository } from './quotes.repository';

/** Quotes the kept list pages may hold across studios, clients and queries. */
export const QUOTE_LIST_CACHE_ROWS = 20_000;

export type Actor = Member & { userId: number };
type Person = { id: number; name: string };

export type QuotesDeps = {
  db: Db;
  repo: QuotesRepository;
  priceTables: PriceTableService;
  invoices: Pick<InvoicesService, 'issueDeposit' | 'issueRevisionDifference' | 'kick'>;
  activity: ActivityService;
  mailer: Pick<Mailer, 'enqueue' | 'kick'>;
  clock: Clock;
  publicUrl: string;
  /** the commission's figures as the figures API shows them */
  figuresOf: (studioId: number, commissionId: number, trx: Db) => Promise<Figure[]>;
  /** whole-batch minutes per stage key → the figure's stage estimates, inside the caller's transaction */
  setStageEstimates: (trx: Db, studioId: number, figureId: number, minutes: Record<string, number>) => Promise<void>;
  /** a lifecycle move inside the caller's transaction (enquiry → quoted when a quote is sent) */
  moveCommission: (trx: Db, by: { studioId: number; userId: number | null }, commissionId: number, to: CommissionStatus) => Promise<void>;
  /** Quotes the kept list pages may hold (default QUOTE_LIST_CACHE_ROWS); 0 turns them off. */
  cacheRows?: number;
};

/** The engine's complaints as a 422 whose fields point into the quote input. */
function unpriceable(e: QuoteInputError) {
  const fields: Record<string, string> = {};
  for (const i of e.issues) fields[i.path.filter((p) => p !== 'priceTable').join('.') || '_'] ??= i.message;
  const tableIssue = e.issues.find((i) => i.path[0] === 'priceTable');
  return errors.unprocessable(tableIssue ? `The price table needs a look before quoting: ${tableIssue.message}` : `This quote cannot be priced: ${e.issues[0]?.message ?? e.message}`, fields);
}

/** Hours hidden: the result keeps amounts only (and the breakdown written for clients). */
function forClient(r: QuoteResult): ClientQuoteResult {
  const { totalMinutes: _t, stageMinutes: _s, lines, ...rest } = r;
  return {
    ...rest,
    lines: lines.map((l) =>
      l.type === 'figure'
        ? {
            type: 'figure',
            id: l.id,
            name: l.name,
            quantity: l.quantity,
            sizeClass: l.sizeClass,
            tier: l.tier,
            tierLabel: l.tierLabel,
            extras: l.extras.map((e) => ({ key: e.key, label: e.label, kind: e.kind, unitAmount: e.unitAmount })),
            extrasAmount: l.extrasAmount,
            materials: l.materials,
            amount: l.amount,
          }
        : l,
    ),
  };
}

export function quotesService(deps: QuotesDeps) {
  const { db, repo, priceTables, invoices, activity, mailer, clock, publicUrl } = deps;
  const now = () => iso(clock.now());
  const quoteUrl = (studioId: number, id: number) => `${publicUrl}/studio/${studioId}/quotes/${id}`;

  /**
   * The list's pages (the owner's, and each client's) are kept per studio, lists version (moved by the quotes,
   * commissions' titles and clients' names: migrations/20270207120000-lists-version.ts, 20270208120000-...)
   * and query, with the studio's day in the key: a sent quote past its validity is shown as expired, and
   * written so by the request that first reads it that day (its write moves the version, so the next request
   * reads the quotes as they are stored).
   */
  const keptPages = keptReads<Page<QuoteSummary>, VersionInZone>({
    version: (studioId) => repo.listsVersion(studioId),
    maxWeight: deps.cacheRows ?? QUOTE_LIST_CACHE_ROWS,
    weigh: (p) => p.items.length + 1,
  });

  async function price(studioId: number, input: QuoteInput, trx: Db = db): Promise<{ table: PriceTable; today: string; result: QuoteResult }> {
    const table = await priceTables.get(studioId, trx);
    const today = await priceTables.today(studioId, trx);
    try {
      return { table, today, result: quoteFigures({ priceTable: table, figures: input.figures, extraLines: input.extraLines, dueDate: input.dueDate, today }) };
    } catch (e) {
      if (e instanceof QuoteInputError) throw unpriceable(e);
      throw e;
    }
  }

  const priced = (p: Awaited<ReturnType<typeof price>>, input: QuoteInput) => ({
    input_json: JSON.stringify(input),
    price_table_json: JSON.stringify(p.table),
    result_json: JSON.stringify(p.result),
    currency: p.result.currency,
    total: p.result.total,
    deposit: p.result.deposit.amount,
    balance: p.result.balance,
    quote_date: p.today,
    valid_until: p.result.validUntil,
    show_hours: p.table.showHoursToClient,
    terms: p.table.terms,
  });

  function view(r: QuoteRow, client: boolean): Quote {
    const showHours = !client || r.show_hours;
    const actions: Quote['allowedActions'] = client
      ? r.status === 'sent'
        ? ['accept', 'request-changes', 'decline']
        : []
      : r.status === 'draft'
        ? ['edit', 'send']
        : [];
    return {
      id: r.id,
      commissionId: r.commission_id,
      commissionTitle: r.commission_title,
      client: { id: r.client_id, name: r.client_name },
      version: r.version,
      status: r.status,
      input: showHours ? r.input : null,
      result: showHours ? r.result : forClient(r.result),
      currency: r.currency,
      total: r.total,
      deposit: r.deposit,
      balance: r.balance,
      quoteDate: r.quote_date,
      validUntil: r.valid_until,
      showHoursToClient: r.show_hours,
      sentAt: r.sent_at,
      decidedAt: r.decided_at,
      decidedBy: r.decided_by !== null && r.decided_by_name !== null ? { id: r.decided_by, name: r.decided_by_name } : null,
      acceptedName: r.accepted_name,
      decisionComment: r.decision_comment,
      terms: r.terms,
      allowedActions: actions,
      createdAt: r.created_at,
      updatedAt: r.updated_at,
    };
  }

  const summary = (r: QuoteListRow): QuoteSummary => ({
    id: r.id,
    commissionId: r.commission_id,
    commissionTitle: r.commission_title,
    client: { id: r.client_id, name: r.client_name },
    version: r.version,
    status: r.status,
    currency: r.currency,
    total: r.total,
    deposit: r.deposit,
    balance: r.balance,
    validUntil: r.valid_until,
    sentAt: r.sent_at,
    decidedAt: r.decided_at,
    createdAt: r.created_at,
  });

  /** A sent quote past its validity becomes expired (checked on every read and decision, and by the job). */
  async function expireIfDue(r: QuoteRow, trx: Db = db): Promise<QuoteRow> {
    if (r.status !== 'sent') return r;
    if (r.valid_until >= (await priceTables.today(r.studio_id, trx))) return r;
    await repo.update(trx, r.studio_id, r.id, { status: 'expired', updated_at: now() }, ['sent']);
    return { ...r, status: 'expired' };
  }

  /** The quote if the actor may see it: the owner all, a client only their own that were sent (else 404). */
  async function visible(actor: Member, id: number, trx: Db = db) {
    const r = await repo.get(actor.studioId, id, trx);
    if (!r || (actor.role === 'client' && (r.client_id !== actor.clientId || r.status === 'draft'))) throw errors.notFound('That quote');
    return expireIfDue(r, trx);
  }

  async function mailOwners(trx: Db, r: QuoteRow, template: string, subject: string, lines: string[]) {
    for (const o of await repo.owners(r.studio_id, trx)) {
      const mail = templates.notice({ subject, lines: [`Hello ${o.name},`, ...lines], action: { label: 'Open the quote', url: quoteUrl(r.studio_id, r.id) } });
      await mailer.enqueue({ ...mail, to: o.email, template, studioId: r.studio_id }, trx);
    }
  }

  /** The figures of a commission as engine lines; overrides adjust hours per figure. */
  function figureLines(figs: Figure[], overrides: CreateQuoteInput['figureOverrides'] = []): QuoteFigure[] {
    const byId = new Map(overrides.map((o) => [o.figureId, o]));
    overrides.forEach((o, i) => {
      if (!figs.some((f) => f.id === o.figureId)) throw errors.field(`figureOverrides.${i}.figureId`, 'That figure is not part of this commission.');
    });
    return figs.map((f) => ({
      id: f.id,
      name: f.name,
      quantity: f.quantity,
      sizeClass: f.sizeClass,
      tier: f.tier,
      extras: f.extras,
      stageHours: byId.get(f.id)?.stageHours ?? {},
      omitStages: byId.get(f.id)?.omitStages ?? [],
    }));
  }

  async function decide(actor: Actor, user: Person, id: number, to: 'changes_requested' | 'declined', comment: string | null) {
    const r0 = await visible(actor, id);
    if (r0.status === 'expired') throw errors.gone('This quote has expired; ask the studio for a new one.');
    const r = await db.transaction(async (trx) => {
      const r = (await visible(actor, id, trx))!;
      if (r.status !== 'sent' || !(await repo.update(trx, actor.studioId, id, { status: to, decided_at: now(), decided_by: user.id, decision_comment: comment, updated_at: now() }, ['sent']))) {
        throw errors.conflict('This quote has been answered already.', 'quote_decided');
      }
      const what = to === 'declined' ? 'declined' : 'asked for changes to';
      await activity.record(trx, { studioId: actor.studioId, commissionId: r.commission_id, userId: user.id, action: `quote.${to}`, detail: { quoteId: id, version: r.version, summary: `${what} version ${r.version} of the quote.` } });
      await mailOwners(trx, r, `quote.${to}`, `${user.name} ${what} quote version ${r.version}: “${r.commission_title}”`, [
        `${user.name} ${what} version ${r.version} of the quote for “${r.commission_title}”.`,
        ...(comment ? [comment.length > 600 ? `${comment.slice(0, 599)}…` : comment] : []),
      ]);
      return r;
    });
    mailer.kick();
    return view((await repo.get(actor.studioId, r.id))!, true);
  }

  return {
    list(actor: Member, q: QuoteListQuery): Promise<Page<QuoteSummary>> {
      const client = actor.role === 'client';
      const onlyClientId = client ? (actor.clientId ?? -1) : undefined;
      let day: string | undefined;
      const key = (at: VersionInZone) => {
        day = localDateOf(clock.now().getTime(), at.timeZone);
        return JSON.stringify([day, onlyClientId ?? null, q.commissionId ?? null, q.status ?? null, q.q ?? null, q.limit, q.offset]);
      };
      return keptPages(actor.studioId, key, async () => {
        const { rows, total } = await repo.list(actor.studioId, { ...q, onlyClientId, hideDrafts: client });
        // One look at the studio's date for the whole page (the key's, when kept), and one update for the quotes on it that ran out.
        const sent = rows.filter((r) => r.status === 'sent');
        const today = sent.length ? (day ?? (await priceTables.today(actor.studioId))) : '';
        const due = sent.filter((r) => r.valid_until < today).map((r) => r.id);
        if (due.length) await repo.expire(db, actor.studioId, due, now());
        const fresh = rows.map((r) => (due.includes(r.id) ? { ...r, status: 'expired' as const } : r));
        return { items: fresh.map(summary), total, limit: q.limit, offset: q.offset };
      });
    },

    async get(actor: Member, id: number) {
      return view(await visible(actor, id), actor.role === 'client');
    },

    /** A draft built from the commission's figures; its version is one more than the commission's last quote. */
    async create(actor: Actor, commissionId: number, input: CreateQuoteInput) {
      const id = await db.transaction(async (trx) => {
        const c = await repo.commission(actor.studioId, commissionId, trx);
        if (!c) throw errors.notFound('That commission');
        if (lockedStatuses.includes(c.status)) throw errors.conflict('This commission is closed; it takes no more quotes.', 'commission_locked');
        const today = await priceTables.today(actor.studioId, trx);
        const dueDate = input.dueDate !== undefined ? input.dueDate : c.due_date && c.due_date >= today ? c.due_date : null;
        const quoteInput: QuoteInput = { figures: figureLines(await deps.figuresOf(actor.studioId, commissionId, trx), input.figureOverrides), extraLines: input.extraLines ?? [], dueDate };
        const p = await price(actor.studioId, quoteInput, trx);
        const t = now();
        const version = await repo.nextVersion(actor.studioId, commissionId, trx);
        const id = await repo.insert(trx, {
          studio_id: actor.studioId,
          commission_id: commissionId,
          client_id: c.client_id,
          version,
          status: 'draft',
          ...priced(p, quoteInput),
          created_by: actor.userId,
          created_at: t,
          updated_at: t,
        });
        await activity.record(trx, { studioId: actor.studioId, commissionId, userId: actor.userId, action: 'quote.created', detail: { quoteId: id, version, summary: `drafted version ${version} of the quote.` } });
        return id;
      });
      return view((await repo.get(actor.studioId, id))!, false);
    },

    /** Drafts only: a sent quote is frozen (409); the change is priced again with today's table. */
    async update(actor: Actor, id: number, input: UpdateQuoteInput) {
      await db.transaction(async (trx) => {
        const r = await visible(actor, id, trx);
        if (r.status !== 'draft') throw errors.conflict('This quote has been sent and is frozen; revise it as a new version instead.', 'quote_frozen');
        const next: QuoteInput = {
          figures: input.figures ?? r.input.figures,
          extraLines: input.extraLines ?? r.input.extraLines,
          dueDate: input.dueDate !== undefined ? input.dueDate : r.input.dueDate,
        };
        const p = await price(actor.studioId, next, trx);
        await repo.update(trx, actor.studioId, id, { ...priced(p, next), updated_at: now() }, ['draft']);
      });
      return view((await repo.get(actor.studioId, id))!, false);
    },

    /** The same engine the form runs, with the studio's table and today's date, so the two agree. */
    async preview(actor: Member, input: ParsedQuotePreviewInput) {
      if (input.commissionId && !(await repo.commission(actor.studioId, input.commissionId))) throw errors.field('commissionId', 'Choose a commission of this studio.');
      return (await price(actor.studioId, { figures: input.figures, extraLines: input.extraLines, dueDate: input.dueDate })).result;
    },

    /** Draft → sent: priced once more as of today, frozen, earlier open versions superseded, the client mailed. */
    async send(actor: Actor, id: number) {
      await db.transaction(async (trx) => {
        const r = await visible(actor, id, trx);
        if (r.status !== 'draft') throw errors.conflict('This quote has been sent already.', 'quote_frozen');
        const c = (await repo.commission(actor.studioId, r.commission_id, trx))!;
        if (lockedStatuses.includes(c.status)) throw errors.conflict('This commission is closed; it takes no more quotes.', 'commission_locked');
        const p = await price(actor.studioId, r.input, trx);
        const t = now();
        if (!(await repo.update(trx, actor.studioId, id, { ...priced(p, r.input), status: 'sent', sent_at: t, updated_at: t }, ['draft']))) {
          throw errors.conflict('This quote has been sent already.', 'quote_frozen');
        }
        await repo.supersedeOthers(trx, actor.studioId, r.commission_id, id, ['draft', 'sent', 'changes_requested'], t);
        if (c.status === 'enquiry') await deps.moveCommission(trx, actor, r.commission_id, 'quoted');
        await activity.record(trx, { studioId: actor.studioId, commissionId: r.commission_id, userId: actor.userId, action: 'quote.sent', detail: { quoteId: id, version: r.version, summary: `sent version ${r.version} of the quote to the client.` } });
        const client = await repo.clientContact(actor.studioId, r.client_id, trx);
        const s = await repo.studio(actor.studioId, trx);
        if (client?.email) {
          const amount = formatMoney(p.result.total, p.result.currency);
          const mail = templates.notice({
            subject: `${s?.name}: your quote for “${r.commission_title}” (${amount})`,
            lines: [
              `Hello ${client.name},`,
              `${s?.name} has sent you a quote for “${r.commission_title}”: ${amount}, with a deposit of ${formatMoney(p.result.deposit.amount, p.result.currency)} to book your place in the queue.`,
              `The quote is valid until ${p.result.validUntil}. You can accept it, ask for changes or decline it from the quote page.`,
            ],
            action: { label: 'Read the quote', url: quoteUrl(actor.studioId, id) },
          });
          await mailer.enqueue({ ...mail, to: client.email, template: 'quote.sent', studioId: actor.studioId }, trx);
        }
      });
      mailer.kick();
      return view((await repo.get(actor.studioId, id))!, false);
    },

    /**
     * The client accepts with their typed name and the terms ticked; time, person and address are stored.
     * The first acceptance issues the deposit invoice; a later version invoices or credits the difference.
     * The accepted hours per stage become the figures' stage estimates.
     */
    async accept(actor: Actor, user: Person, id: number, input: AcceptQuoteInput, ip: string | null) {
      const r0 = await visible(actor, id);
      if (r0.status === 'expired') throw errors.gone('This quote has expired; ask the studio for a new one.');
      await db.transaction(async (trx) => {
        const r = await visible(actor, id, trx);
        const t = now();
        // read before this one turns accepted: the version the client accepted earlier, if any
        const prev = await repo.accepted(actor.studioId, r.commission_id, trx);
        if (r.status !== 'sent' || !(await repo.update(trx, actor.studioId, id, { status: 'accepted', decided_at: t, decided_by: user.id, accepted_name: input.name, accepted_ip: ip?.slice(0, 64) ?? null, updated_at: t }, ['sent']))) {
          throw errors.conflict('This quote has been answered already.', 'quote_decided');
        }
        const accepted = (await repo.get(actor.studioId, id, trx))!;
        const by = { studioId: actor.studioId, userId: user.id };
        if (prev) {
          await repo.update(trx, actor.studioId, prev.id, { status: 'superseded', updated_at: t }, ['accepted']);
          await invoices.issueRevisionDifference(trx, by, prev, accepted, r.commission_title);
        } else {
          await invoices.issueDeposit(trx, by, accepted, r.commission_title);
        }
        const c = (await repo.commission(actor.studioId, r.commission_id, trx))!;
        if (!lockedStatuses.includes(c.status)) {
          // only this commission's figures: a line's id comes from the (editable) quote input
          const own = new Set((await deps.figuresOf(actor.studioId, r.commission_id, trx)).map((f) => f.id));
          for (const l of accepted.result.lines) {
            if (l.type === 'figure' && typeof l.id === 'number' && own.has(l.id)) await deps.setStageEstimates(trx, actor.studioId, l.id, l.batchStageMinutes);
          }
        }
        await activity.record(trx, { studioId: actor.studioId, commissionId: r.commission_id, userId: user.id, action: 'quote.accepted', detail: { quoteId: id, version: r.version, summary: `accepted version ${r.version} of the quote.` } });
        await mailOwners(trx, accepted, 'quote.accepted', `${user.name} accepted quote version ${r.version}: “${r.commission_title}”`, [
          `${user.name} accepted version ${r.version} of the quote for “${r.commission_title}” (${formatMoney(accepted.total, accepted.currency)}), signing as “${input.name}”.`,
          prev ? 'The difference to the earlier version has been invoiced or credited.' : 'The deposit invoice has been sent to the client.',
        ]);
      });
      invoices.kick();
      return view((await repo.get(actor.studioId, id))!, true);
    },

    requestChanges: (actor: Actor, user: Person, id: number, input: RequestQuoteChangesInput) => decide(actor, user, id, 'changes_requested', input.comment),
    decline: (actor: Actor, user: Person, id: number, input: DeclineQuoteInput) => decide(actor, user, id, 'declined', input.comment ?? null),

    /** Scheduled: sent quotes past their validity become expired. */
    async expireDue() {
      const candidates = await repo.sentBefore(addDays(clock.now().toISOString().slice(0, 10), 1));
      let n = 0;
      for (const q of candidates) {
        if (q.valid_until >= localDateOf(clock.now().getTime(), q.timezone)) continue;
        if (await repo.update(db, q.studio_id, q.id, { status: 'expired' as QuoteStatus, updated_at: now() }, ['sent'])) n++;
      }
      return n;
    },
  };
}

export type QuotesService = ReturnType<typeof quotesService>;
