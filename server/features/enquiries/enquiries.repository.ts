import type { EnquiryListQuery, EnquiryStatus } from '../../../shared/schemas/enquiries';
import type { Db } from '../../lib/db';
import { listsVersion } from '../../lib/version-cache';

export type EnquiryRow = {
  id: number;
  studio_id: number;
  status: EnquiryStatus;
  name: string;
  email: string;
  tier: string | null;
  extras: string;
  due_date: string | null;
  budget_minor: number | string | null;
  currency: string;
  notes: string | null;
  consent_at: string;
  created_at: string;
  decided_at: string | null;
  decided_by: number | null;
  decided_by_name?: string | null;
  client_id: number | null;
  commission_id: number | null;
  decline_message: string | null;
};

/** An enquiry as its list shows it. */
export type EnquiryListRow = Pick<EnquiryRow, 'id' | 'status' | 'name' | 'email' | 'tier' | 'due_date' | 'created_at'> & { figure_count: number | string | null; model_count: number | string | null; photo_count: number | string | null };
export type EnquiryFigureRow = { id: number; studio_id: number; enquiry_id: number; position: number; name: string; quantity: number; size_class: string };
export type EnquiryPhotoRow = {
  id: number;
  studio_id: number;
  enquiry_id: number;
  storage_key: string;
  format: 'jpeg' | 'png' | 'webp';
  width: number;
  height: number;
  bytes: number;
  photo_id: number | null;
  created_at: string;
};
export type ClientMatchRow = { id: number; name: string; email: string | null; user_id: number | null };

const idOf = (row: unknown) => (typeof row === 'object' && row !== null ? (row as { id: number }).id : (row as number));

/** Enquiries of one studio; every query takes the studio id first. */
export function enquiriesRepository(db: Db) {
  return {
    /** The version the kept enquiry list is read under (server/lib/version-cache.ts). */
    listsVersion: (studioId: number) => listsVersion(db, studioId),
    async insert(trx: Db, row: Omit<EnquiryRow, 'id' | 'decided_at' | 'decided_by' | 'client_id' | 'commission_id' | 'decline_message'>) {
      const [r] = await trx('enquiries').insert(row).returning('id');
      return idOf(r);
    },
    insertFigures: (trx: Db, rows: Omit<EnquiryFigureRow, 'id'>[]) => (rows.length ? trx('enquiry_figures').insert(rows) : Promise.resolve()),
    insertPhoto: (trx: Db, row: Omit<EnquiryPhotoRow, 'id' | 'photo_id'>) => trx('enquiry_photos').insert(row),

    get: (studioId: number, id: number, trx: Db = db) =>
      trx('enquiries as e')
        .leftJoin('users as u', 'u.id', 'e.decided_by')
        .where({ 'e.studio_id': studioId, 'e.id': id })
        .first('e.*', 'u.name as decided_by_name') as Promise<EnquiryRow | undefined>,
    figures: (studioId: number, enquiryId: number) =>
      db('enquiry_figures').where({ studio_id: studioId, enquiry_id: enquiryId }).orderBy('position') as Promise<EnquiryFigureRow[]>,
    photos: (studioId: number, enquiryId: number, trx: Db = db) =>
      trx('enquiry_photos').where({ studio_id: studioId, enquiry_id: enquiryId }).orderBy('id') as Promise<EnquiryPhotoRow[]>,
    photo: (studioId: number, enquiryId: number, photoId: number) =>
      db('enquiry_photos').where({ studio_id: studioId, enquiry_id: enquiryId, id: photoId }).first() as Promise<EnquiryPhotoRow | undefined>,

    async list(studioId: number, q: EnquiryListQuery) {
      const filter = (qb: ReturnType<typeof db>) => {
        qb.where('e.studio_id', studioId);
        if (q.status) qb.where('e.status', q.status);
        if (q.q) {
          const like = `%${q.q.toLowerCase().replace(/[\\%_]/g, (c) => `\\${c}`)}%`;
          qb.where((w) => w.whereRaw("lower(e.name) like ? escape '\\'", [like]).orWhereRaw("lower(e.email) like ? escape '\\'", [like]));
        }
        return qb;
      };
      const [rows, count] = await Promise.all([
        filter(db('enquiries as e'))
          // what a summary shows: not the notes, extras or consent of each enquiry
          .select('e.id', 'e.status', 'e.name', 'e.email', 'e.tier', 'e.due_date', 'e.created_at')
          .orderBy([{ column: 'e.created_at', order: 'desc' }, { column: 'e.id', order: 'desc' }])
          .limit(q.limit)
          .offset(q.offset),
        filter(db('enquiries as e')).count({ n: '*' }).first(),
      ]);
      // Figure and photo counts of the page's enquiries only: one grouped query each, whatever the studio holds.
      const ids = (rows as { id: number }[]).map((r) => r.id);
      const [figures, photos] = ids.length
        ? await Promise.all([
            db('enquiry_figures').where('studio_id', studioId).whereIn('enquiry_id', ids).groupBy('enquiry_id').select('enquiry_id').count({ figure_count: '*' }).sum({ model_count: 'quantity' }),
            db('enquiry_photos').where('studio_id', studioId).whereIn('enquiry_id', ids).groupBy('enquiry_id').select('enquiry_id').count({ photo_count: '*' }),
          ])
        : [[], []];
      const figuresOf = new Map((figures as Record<string, unknown>[]).map((f) => [Number(f.enquiry_id), f]));
      const photosOf = new Map((photos as Record<string, unknown>[]).map((p) => [Number(p.enquiry_id), p]));
      // Built key by key: a spread copy of a driver's row object is slow.
      const withCounts = (rows as EnquiryListRow[]).map((r) => ({
        id: r.id,
        status: r.status,
        name: r.name,
        email: r.email,
        tier: r.tier,
        due_date: r.due_date,
        created_at: r.created_at,
        figure_count: figuresOf.get(Number(r.id))?.figure_count ?? 0,
        model_count: figuresOf.get(Number(r.id))?.model_count ?? 0,
        photo_count: photosOf.get(Number(r.id))?.photo_count ?? 0,
      }));
      return { rows: withCounts as EnquiryListRow[], total: Number(count?.n ?? 0) };
    },
    countNew: (studioId: number) => db('enquiries').where({ studio_id: studioId, status: 'new' }).count({ n: '*' }).first().then((r) => Number(r?.n ?? 0)),

    /** Only the caller whose update changes the row decides the enquiry, so a double click cannot accept twice. */
    decide: (trx: Db, studioId: number, id: number, patch: { status: EnquiryStatus; decided_at: string; decided_by: number; decline_message?: string }) =>
      trx('enquiries').where({ studio_id: studioId, id, status: 'new' }).update(patch),
    /** Puts an accepted enquiry back to new when the commission could not be made. */
    undecide: (studioId: number, id: number) =>
      db('enquiries').where({ studio_id: studioId, id, status: 'accepted' }).whereNull('commission_id').update({ status: 'new', decided_at: null, decided_by: null }),
    link: (trx: Db, studioId: number, id: number, patch: { client_id: number; commission_id: number }) => trx('enquiries').where({ studio_id: studioId, id }).update(patch),
    linkPhoto: (trx: Db, studioId: number, id: number, photoId: number) => trx('enquiry_photos').where({ studio_id: studioId, id }).update({ photo_id: photoId }),

    /** E-mail addresses match ignoring case, whatever case an older record was saved in. */
    clientByEmail: (studioId: number, email: string, trx: Db = db) =>
      trx('clients').where({ studio_id: studioId }).whereRaw('lower(email) = ?', [email.trim().toLowerCase()]).orderBy('id').first('id', 'name', 'email', 'user_id') as Promise<
        ClientMatchRow | undefined
      >,
    client: (studioId: number, id: number, trx: Db = db) => trx('clients').where({ studio_id: studioId, id }).first('id', 'name', 'email', 'user_id') as Promise<ClientMatchRow | undefined>,
    async createClient(trx: Db, studioId: number, c: { name: string; email: string; notes: string }, now: string) {
      const [r] = await trx('clients').insert({ studio_id: studioId, name: c.name, email: c.email.trim().toLowerCase(), notes: c.notes, created_at: now, updated_at: now }).returning('id');
      return idOf(r);
    },
    /** The enquiry's photo becomes a reference photo of the commission, on the same stored files. */
    async insertReferencePhoto(trx: Db, row: { studio_id: number; commission_id: number; width: number; height: number; bytes: number; storage_key: string; format: string; created_at: string }) {
      const [r] = await trx('photos')
        .insert({ ...row, kind: 'reference', caption: 'Sent with the enquiry', shared: true, uploaded_by: null })
        .returning('id');
      return idOf(r);
    },

    studio: (studioId: number, trx: Db = db) =>
      trx('studios').where({ id: studioId }).first('id', 'name', 'slug', 'currency', 'timezone') as Promise<{ id: number; name: string; slug: string; currency: string; timezone: string } | undefined>,
    userName: (userId: number) => db('users').where({ id: userId }).first('name').then((r) => (r?.name as string | undefined) ?? null),
    /** Owners who take e-mail notices. */
    owners: (studioId: number, trx: Db = db) =>
      trx('memberships as m')
        .join('users as u', 'u.id', 'm.user_id')
        .where({ 'm.studio_id': studioId, 'm.role': 'owner', 'u.email_notices': true })
        .select('u.id', 'u.email', 'u.name') as Promise<{ id: number; email: string; name: string }[]>,
  };
}

export type EnquiriesRepository = ReturnType<typeof enquiriesRepository>;
