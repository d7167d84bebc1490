import crypto from 'node:crypto';
import type { Knex } from 'knex';
import type { Db } from '../../lib/db';
import { clientTables, type ClientTable, type TableUse } from './privacy.tables';

export type ClientRow = {
  id: number;
  studio_id: number;
  user_id: number | null;
  name: string;
  email: string | null;
  erased_at: string | null;
};

/** Who the export and the erase are about: the client record, their account, their e-mail addresses. */
export type Scope = { studioId: number; clientId: number; userId: number | null; emails: string[]; names: string[] };

type Row = Record<string, unknown>;
type Query = Knex.QueryBuilder;

const idOf = (r: unknown) => (typeof r === 'object' && r !== null ? Number((r as { id: number }).id) : Number(r));
const likeEscape = (s: string) => s.replace(/[\\%_]/g, (c) => `\\${c}`);

/** The people columns whose names the export lists beside the rows. */
const PEOPLE_COLUMNS = ['user_id', 'created_by', 'decided_by', 'requested_by', 'uploaded_by', 'painter_id', 'done_by', 'recorded_by', 'shipped_by', 'updated_by', 'invited_by'];
/** Commission statuses with nothing more to do. */
const DONE = ['closed', 'cancelled'];

export function privacyRepository(db: Db) {
  // Sub-queries that pick the client's rows; every one is scoped by the studio id.
  const commissionsOf = (t: Db, s: Scope) => t('commissions').where({ studio_id: s.studioId, client_id: s.clientId }).select('id');
  const invoicesOf = (t: Db, s: Scope) =>
    t('invoices')
      .where('studio_id', s.studioId)
      .where((w) => w.where('client_id', s.clientId).orWhereIn('commission_id', commissionsOf(t, s)))
      .select('id');
  const photosOf = (t: Db, s: Scope) => t('photos').where('studio_id', s.studioId).whereIn('commission_id', commissionsOf(t, s)).select('id');
  const enquiriesOf = (t: Db, s: Scope) =>
    t('enquiries')
      .where('studio_id', s.studioId)
      .where((w) => {
        w.where('client_id', s.clientId).orWhereIn('commission_id', commissionsOf(t, s));
        if (s.emails.length) w.orWhereIn('email', s.emails);
      })
      .select('id');
  const recipesOf = (t: Db, s: Scope) =>
    t('recipes')
      .where('studio_id', s.studioId)
      .where((w) => w.whereIn('id', t('schemes').where('studio_id', s.studioId).whereIn('commission_id', commissionsOf(t, s)).select('recipe_id')).orWhereIn('source_photo_id', photosOf(t, s)))
      .select('id');
  const stepsOf = (t: Db, s: Scope) => t('recipe_steps').where('studio_id', s.studioId).whereIn('recipe_id', recipesOf(t, s)).select('id');
  const nothing = (t: Db, table: string) => t(table).whereRaw('1 = 0');
  const byCommission = (table: string) => (t: Db, s: Scope) => t(table).where('studio_id', s.studioId).whereIn('commission_id', commissionsOf(t, s));
  const byInvoice = (table: string) => (t: Db, s: Scope) => t(table).where('studio_id', s.studioId).whereIn('invoice_id', invoicesOf(t, s));

  /**
   * The rows of each table that concern the client. The record type makes every table on the
   * client list have one, so a table cannot join the list without saying which of its rows count.
   */
  const scopes: Record<ClientTable, (t: Db, s: Scope) => Query> = {
    clients: (t, s) => t('clients').where({ studio_id: s.studioId, id: s.clientId }),
    users: (t, s) => (s.userId ? t('users').where('id', s.userId) : nothing(t, 'users')),
    memberships: (t, s) => (s.userId ? t('memberships').where({ studio_id: s.studioId, user_id: s.userId }) : nothing(t, 'memberships')),
    invitations: (t, s) =>
      t('invitations')
        .where('studio_id', s.studioId)
        .where((w) => {
          w.where('client_id', s.clientId);
          if (s.emails.length) w.orWhere((x) => x.where('role', 'client').whereIn('email', s.emails));
        }),
    calendar_feeds: (t, s) => (s.userId ? t('calendar_feeds').where({ studio_id: s.studioId, user_id: s.userId }) : nothing(t, 'calendar_feeds')),
    password_resets: (t, s) => (s.userId ? t('password_resets').where('user_id', s.userId) : nothing(t, 'password_resets')),
    // Throttling keys carry the e-mail address beside other parts ("account:<e-mail>", "<e-mail>|<address>").
    login_failures: (t, s) =>
      s.emails.length
        ? t('login_failures').where((w) => {
            for (const e of s.emails) {
              w.orWhere('key', e);
              for (const pattern of [`${likeEscape(e)}|%`, `%:${likeEscape(e)}`, `%:${likeEscape(e)}|%`]) w.orWhereRaw(`?? like ? escape '\\'`, ['key', pattern]);
            }
          })
        : nothing(t, 'login_failures'),
    sessions: (t) => nothing(t, 'sessions'),
    // The studio's mails to the client; the account's own mails (sign-in links) are not the studio's to export.
    outbox: (t, s) => t('outbox').where('studio_id', s.studioId).whereIn('to', s.emails),
    commissions: (t, s) => t('commissions').where({ studio_id: s.studioId, client_id: s.clientId }),
    figures: byCommission('figures'),
    stages: byCommission('stages'),
    time_entries: byCommission('time_entries'),
    activity: byCommission('activity'),
    photos: byCommission('photos'),
    photo_palettes: (t, s) => t('photo_palettes').where('studio_id', s.studioId).whereIn('photo_id', photosOf(t, s)),
    comments: byCommission('comments'),
    approvals: byCommission('approvals'),
    schemes: byCommission('schemes'),
    recipes: (t, s) => t('recipes').whereIn('id', recipesOf(t, s)),
    recipe_steps: (t, s) => t('recipe_steps').whereIn('id', stepsOf(t, s)),
    recipe_step_paints: (t, s) => t('recipe_step_paints').where('studio_id', s.studioId).whereIn('step_id', stepsOf(t, s)),
    paints: (t, s) => t('paints').where('studio_id', s.studioId).whereIn('id', t('recipe_step_paints').where('studio_id', s.studioId).whereIn('step_id', stepsOf(t, s)).select('paint_id')),
    enquiries: (t, s) => t('enquiries').whereIn('id', enquiriesOf(t, s)),
    enquiry_figures: (t, s) => t('enquiry_figures').where('studio_id', s.studioId).whereIn('enquiry_id', enquiriesOf(t, s)),
    enquiry_photos: (t, s) => t('enquiry_photos').where('studio_id', s.studioId).whereIn('enquiry_id', enquiriesOf(t, s)),
    models_in: byCommission('models_in'),
    models_in_figures: byCommission('models_in_figures'),
    shipments: byCommission('shipments'),
    quotes: byCommission('quotes'),
    invoices: (t, s) => t('invoices').whereIn('id', invoicesOf(t, s)),
    invoice_payments: byInvoice('invoice_payments'),
    invoice_refunds: byInvoice('invoice_refunds'),
    checkouts: byInvoice('checkouts'),
    payment_events: byInvoice('payment_events'),
    invoice_reminders: (t, s) => t('invoice_reminders').whereIn('invoice_id', invoicesOf(t, s)),
  };

  const withoutColumns = (rows: Row[], omit: string[] = []) => rows.map((r) => Object.fromEntries(Object.entries(r).filter(([k]) => !omit.includes(k))));

  return {
    client: (studioId: number, clientId: number, trx: Db = db) =>
      trx('clients').where({ studio_id: studioId, id: clientId }).first('id', 'studio_id', 'user_id', 'name', 'email', 'erased_at') as Promise<ClientRow | undefined>,

    async scope(trx: Db, c: ClientRow): Promise<Scope> {
      const user = c.user_id ? await trx('users').where('id', c.user_id).first('id', 'email', 'name') : undefined;
      const own = [c.email, user?.email].filter((e): e is string => !!e).map((e) => e.toLowerCase());
      const enquirers = await trx('enquiries')
        .where('studio_id', c.studio_id)
        .where((w) => {
          w.where('client_id', c.id);
          if (own.length) w.orWhereIn('email', own);
        })
        .select('name', 'email');
      const emails = [...own, ...enquirers.map((e) => String(e.email).toLowerCase())];
      const names = [c.name, user?.name, ...enquirers.map((e) => e.name as string)].filter((n): n is string => !!n);
      return { studioId: c.studio_id, clientId: c.id, userId: user ? Number(user.id) : null, emails: [...new Set(emails)], names: [...new Set(names)] };
    },

    /** The rows of every exported table, minus the columns that are secrets or the studio's internals. */
    async exportRows(trx: Db, s: Scope) {
      const out: Partial<Record<ClientTable, Row[]>> = {};
      for (const [table, use] of Object.entries(clientTables) as [ClientTable, TableUse][]) {
        if (use.export !== 'rows') continue;
        out[table] = withoutColumns(await scopes[table](trx, s).select(`${table}.*`), use.omit);
      }
      return out;
    },

    /** Names of the people the rows mention: the studio's members and the client themselves. */
    async people(trx: Db, studioId: number, rows: Row[][]) {
      const ids = new Set<number>();
      for (const list of rows) for (const r of list) for (const col of PEOPLE_COLUMNS) if (typeof r[col] === 'number') ids.add(r[col] as number);
      if (!ids.size) return [];
      return trx('users as u')
        .join('memberships as m', 'm.user_id', 'u.id')
        .where('m.studio_id', studioId)
        .whereIn('u.id', [...ids])
        .select('u.id', 'u.name', 'm.role')
        .orderBy('u.id');
    },

    studio: (studioId: number, trx: Db = db) => trx('studios').where('id', studioId).first('id', 'name') as Promise<{ id: number; name: string }>,

    /** Files of the client's commission photos and enquiry photos. */
    files: async (trx: Db, s: Scope) => ({
      photos: (await scopes.photos(trx, s).select('id', 'commission_id', 'storage_key', 'format')) as { id: number; commission_id: number; storage_key: string; format: string }[],
      enquiryPhotos: (await scopes.enquiry_photos(trx, s).select('id', 'enquiry_id', 'storage_key', 'format')) as { id: number; enquiry_id: number; storage_key: string; format: string }[],
    }),

    counts: async (trx: Db, s: Scope) => {
      const n = async (q: Query) => Number((await q.count({ n: '*' }).first())?.n ?? 0);
      return {
        commissions: await n(scopes.commissions(trx, s)),
        photos: await n(scopes.photos(trx, s)),
        issuedInvoices: await n(scopes.invoices(trx, s).whereNotNull('number')),
        enquiries: await n(scopes.enquiries(trx, s)),
      };
    },

    /** Commissions still in progress (not closed, cancelled or delivered), with how many issued invoices each has. */
    openCommissions: (trx: Db, s: Scope) =>
      scopes
        .commissions(trx, s)
        .whereNotIn('status', DONE)
        .whereNotExists(trx('shipments as sh').whereRaw('sh.commission_id = commissions.id').where('sh.status', 'delivered'))
        .select(
          'commissions.id',
          'commissions.title',
          'commissions.status',
          trx('invoices as i').whereRaw('i.commission_id = commissions.id').whereNotNull('i.number').count('*').as('issued'),
        )
        .orderBy('commissions.id') as Promise<{ id: number; title: string; status: string; issued: number | string }[]>,

    /** Issued invoices and credit notes with money still to move. */
    unpaidInvoices: (trx: Db, s: Scope) =>
      scopes
        .invoices(trx, s)
        .whereIn('status', ['open', 'partly_paid'])
        .whereNotNull('number')
        .select('id', 'number', 'kind', 'currency', 'total', 'paid', 'credited', 'status')
        .orderBy('id') as Promise<{ id: number; number: string; kind: string; currency: string; total: number | string; paid: number | string; credited: number | string; status: string }[]>,

    /** Commissions an issued invoice points at: they stay, anonymised. */
    keptCommissionIds: async (trx: Db, s: Scope) =>
      (await scopes.commissions(trx, s).whereExists(trx('invoices as i').whereRaw('i.commission_id = commissions.id').whereNotNull('i.number')).select('id')).map((r: { id: number }) => Number(r.id)),

    // The erase, table by table; every call runs in the caller's transaction.
    deleteRows: (trx: Db, s: Scope, table: ClientTable) => scopes[table](trx, s).delete(),
    deleteDraftInvoices: (trx: Db, s: Scope) => scopes.invoices(trx, s).whereNull('number').delete(),
    deleteCommissionsExcept: (trx: Db, s: Scope, keep: number[]) => scopes.commissions(trx, s).whereNotIn('id', keep).delete(),

    rowsOf: (trx: Db, s: Scope, table: ClientTable, columns: string[]) => scopes[table](trx, s).select(columns.map((c) => `${table}.${c}`)) as Promise<Row[]>,
    updateRow: (trx: Db, table: string, id: number, patch: Row) => trx(table).where('id', id).update(patch),
    updatePaymentEvent: (trx: Db, id: string, payload: string) => trx('payment_events').where('id', id).update({ payload }),

    clearKeptCommissions: (trx: Db, s: Scope, at: string) =>
      scopes.commissions(trx, s).update({ brief: null, scheme_notes: null, cancel_reason: null, updated_at: at }),
    clearTimeNotes: (trx: Db, s: Scope) => scopes.time_entries(trx, s).whereNotNull('note').update({ note: null }),
    unlinkActivityAuthor: (trx: Db, s: Scope, userId: number) => scopes.activity(trx, s).where('user_id', userId).update({ user_id: null }),

    /** The studio's other mails that mention the client (the ones to the client are deleted outright). */
    mailsMentioning(trx: Db, s: Scope, needles: string[]) {
      if (!needles.length) return Promise.resolve([] as Row[]);
      return trx('outbox')
        .where('studio_id', s.studioId)
        .where((w) => {
          for (const n of needles) {
            const like = `%${likeEscape(n)}%`;
            const lower = `%${likeEscape(n.toLowerCase())}%`;
            for (const col of ['subject', 'text', 'html']) {
              w.orWhereRaw(`?? like ? escape '\\'`, [col, like]).orWhereRaw(`lower(??) like ? escape '\\'`, [col, lower]);
            }
          }
        })
        .select('id', 'subject', 'text', 'html') as Promise<Row[]>;
    },

    membershipRole: async (trx: Db, s: Scope) =>
      s.userId ? (((await trx('memberships').where({ studio_id: s.studioId, user_id: s.userId }).first('role'))?.role as string | undefined) ?? null) : null,
    /** Mails to the client's addresses: the studio's, and the account's own (sign-in mails) when the account goes too. */
    deleteMailsTo: async (trx: Db, s: Scope, withAccountMail: boolean) =>
      (await scopes.outbox(trx, s).delete()) + (withAccountMail ? await trx('outbox').whereNull('studio_id').whereIn('to', s.emails).delete() : 0),
    membershipsElsewhere: async (trx: Db, s: Scope) =>
      s.userId ? Number((await trx('memberships').where('user_id', s.userId).whereNot('studio_id', s.studioId).count({ n: '*' }).first())?.n ?? 0) : 0,
    /** Time entries are the one reference to a user without ON DELETE (a person who once logged time). */
    timeEntriesOfUser: async (trx: Db, userId: number) => Number((await trx('time_entries').where('user_id', userId).count({ n: '*' }).first())?.n ?? 0),
    deleteUser: (trx: Db, userId: number) => trx('users').where('id', userId).delete(),
    anonymiseUser: (trx: Db, userId: number, at: string) =>
      trx('users')
        .where('id', userId)
        .update({
          email: `erased-user-${userId}@erased.invalid`,
          name: 'Erased person',
          // bcrypt-shaped but random: no password matches it.
          password_hash: `$2b$10$${crypto.randomBytes(40).toString('base64').replace(/[^A-Za-z0-9]/g, '.').slice(0, 53)}`,
          email_notices: false,
          updated_at: at,
        }),
    /** Ends the account's sign-ins: sessions keep the passport user id inside the JSON. */
    async endSessions(trx: Db, userId: number) {
      const rows = await trx('sessions').whereRaw('CAST(sess AS TEXT) LIKE ?', [`%"user":${userId}%`]).select('sid', 'sess');
      const sids = rows
        .filter((r) => {
          try {
            const sess = typeof r.sess === 'string' ? JSON.parse(r.sess) : r.sess;
            return sess?.passport?.user === userId;
          } catch {
            return false;
          }
        })
        .map((r) => r.sid as string);
      if (sids.length) await trx('sessions').whereIn('sid', sids).delete();
      return sids.length;
    },

    anonymiseClient: (trx: Db, s: Scope, placeholder: string, at: string) =>
      trx('clients').where({ studio_id: s.studioId, id: s.clientId }).update({
        name: placeholder,
        user_id: null,
        email: null,
        phone: null,
        address_line1: null,
        address_line2: null,
        address_city: null,
        address_region: null,
        address_postal_code: null,
        address_country: null,
        notes: null,
        erased_at: at,
        updated_at: at,
      }),
    logErased: async (trx: Db, s: Scope, userId: number, at: string) => {
      const [row] = await trx('activity')
        .insert({ studio_id: s.studioId, commission_id: null, user_id: userId, action: 'client.erased', detail: JSON.stringify({ clientId: s.clientId, summary: "erased a client's personal data." }), at })
        .returning('id');
      return idOf(row);
    },
  };
}

export type PrivacyRepository = ReturnType<typeof privacyRepository>;
