import type { Address, CreateClientInput, UpdateClientInput } from '../../../shared/schemas/clients';
import type { Db } from '../../lib/db';

type ClientRow = {
  id: number;
  studio_id: number;
  user_id: number | null;
  erased_at?: string | null;
  name: string;
  email: string | null;
  phone: string | null;
  address_line1: string | null;
  address_line2: string | null;
  address_city: string | null;
  address_region: string | null;
  address_postal_code: string | null;
  address_country: string | null;
  notes: string | null;
  created_at: string;
  invited_at?: string | null;
};

const addressColumns = {
  line1: 'address_line1',
  line2: 'address_line2',
  city: 'address_city',
  region: 'address_region',
  postalCode: 'address_postal_code',
  country: 'address_country',
} as const;

export function toClient(r: ClientRow) {
  const address: Address = {};
  for (const [k, col] of Object.entries(addressColumns)) {
    const v = r[col];
    if (v) address[k as keyof Address] = v;
  }
  return {
    id: r.id,
    name: r.name,
    email: r.email,
    phone: r.phone,
    address,
    notes: r.notes,
    hasAccount: r.user_id !== null,
    invitedAt: r.invited_at ?? null,
    createdAt: r.created_at,
    erasedAt: r.erased_at ?? null,
  };
}

function toRow(input: UpdateClientInput) {
  const row: Record<string, unknown> = {};
  if ('name' in input && input.name !== undefined) row.name = input.name;
  if ('email' in input) row.email = input.email ?? null;
  if ('phone' in input) row.phone = input.phone ?? null;
  if ('notes' in input) row.notes = input.notes ?? null;
  if (input.address) for (const [k, col] of Object.entries(addressColumns)) row[col] = input.address[k as keyof Address] ?? null;
  return row;
}

/** Every query takes the studio id first: a client record never leaves its studio. */
export function clientsRepository(db: Db) {
  const base = (studioId: number) =>
    db('clients as c')
      .where('c.studio_id', studioId)
      .select(
        'c.*',
        db('invitations as i').whereRaw('i.client_id = c.id').whereNull('i.revoked_at').max('i.created_at').as('invited_at'),
      );
  return {
    async list(studioId: number, q: { limit: number; offset: number; q?: string; erased?: 'shown' | 'hidden' }) {
      const filter = (qb: ReturnType<typeof db>) => {
        if (q.erased === 'hidden') qb.whereNull('c.erased_at');
        if (q.q) {
          const like = `%${q.q.toLowerCase().replace(/[\\%_]/g, (c) => `\\${c}`)}%`;
          qb.where((w) => w.whereRaw("lower(c.name) like ? escape '\\'", [like]).orWhereRaw("lower(c.email) like ? escape '\\'", [like]));
        }
        return qb;
      };
      const [rows, count] = await Promise.all([
        filter(base(studioId)).orderBy('c.name').limit(q.limit).offset(q.offset),
        filter(db('clients as c').where('c.studio_id', studioId)).count({ n: '*' }).first(),
      ]);
      return { items: (rows as ClientRow[]).map(toClient), total: Number(count?.n ?? 0), limit: q.limit, offset: q.offset };
    },
    get: (studioId: number, id: number, trx: Db = db) =>
      trx('clients as c').where({ 'c.studio_id': studioId, 'c.id': id }).first('c.*').then((r) => r as ClientRow | undefined),
    getView: (studioId: number, id: number) => base(studioId).where('c.id', id).first().then((r) => (r ? toClient(r as ClientRow) : undefined)),
    findByEmail: (studioId: number, email: string, trx: Db = db) => trx('clients').where({ studio_id: studioId, email: email.toLowerCase() }).first(),
    async create(studioId: number, input: CreateClientInput, now: string, trx: Db = db) {
      const [row] = await trx('clients')
        .insert({ studio_id: studioId, ...toRow(input), created_at: now, updated_at: now })
        .returning('id');
      return typeof row === 'object' ? (row.id as number) : (row as number);
    },
    update: (studioId: number, id: number, input: UpdateClientInput, now: string) =>
      db('clients').where({ studio_id: studioId, id }).update({ ...toRow(input), updated_at: now }),
    linkUser: (studioId: number, id: number, userId: number, now: string, trx: Db = db) =>
      trx('clients').where({ studio_id: studioId, id }).update({ user_id: userId, updated_at: now }),
  };
}

export type ClientsRepository = ReturnType<typeof clientsRepository>;
