import { DEMO_PASSWORD } from '../server/config';
import { iso, type Clock } from '../server/lib/clock';
import type { Db } from '../server/lib/db';
import type { StudiosService } from '../server/features/studios/studios.service';
import type { FileStorage } from '../server/lib/storage/storage';
import { commissionsDemo } from './demo-commissions';
import { enquiriesDemo } from './demo-enquiries';
import { paintsDemo } from './demo-paints';
import { photosDemo } from './demo-photos';
import { booksHistoryDemo, capacityDemo } from './demo-capacity';
import { moneyDemo } from './demo-money';

/**
 * The demo scenario: an invented studio, its people and clients. Every name here is made up
 * (e-mails at demo.test); later features add their part of the story through `demoSteps`.
 */
export type DemoContext = {
  db: Db;
  clock: Clock;
  studioId: number;
  users: { owner: number; painter: number; client: number; client2: number };
  clients: { client: number; client2: number; walkIn: number };
  /** Where demo photos are written (the app's photo storage). */
  photoStorage?: FileStorage;
};
export type DemoStep = (ctx: DemoContext) => Promise<void>;
export const demoSteps: DemoStep[] = [];
demoSteps.push(commissionsDemo);
demoSteps.push(enquiriesDemo);
demoSteps.push(paintsDemo);
demoSteps.push(photosDemo);
// Finished work of the past months first, so its invoice numbers come before the money step's.
demoSteps.push(booksHistoryDemo);
demoSteps.push(moneyDemo);
demoSteps.push(capacityDemo);

export async function seedDemo(db: Db, deps: { clock: Clock; hash: (p: string) => Promise<string>; studios: StudiosService; photoStorage?: FileStorage }) {
  const now = iso(deps.clock.now());
  const passwordHash = await deps.hash(DEMO_PASSWORD);
  const user = async (email: string, name: string) => {
    const [row] = await db('users').insert({ email, name, password_hash: passwordHash, email_notices: true, created_at: now, updated_at: now }).returning('id');
    return typeof row === 'object' ? (row.id as number) : (row as number);
  };
  const owner = await user('owner@demo.test', 'Wren Halloway');
  const painter = await user('painter@demo.test', 'Tobin Ashgrove');
  const clientUser = await user('client@demo.test', 'Priya Castellane');
  const client2User = await user('client2@demo.test', 'Otto Brandvold');

  const studioId = await deps.studios.createStudioFor(owner, { name: 'Marrowgate Paintworks', currency: 'EUR', timezone: 'Europe/Berlin' });
  await db('studios').where({ id: studioId }).update({
    slug: 'marrowgate',
    about: 'A two-brush studio in a converted bakery. We paint armies for the table and single figures for the shelf.',
  });
  const member = (userId: number, role: string) => db('memberships').insert({ studio_id: studioId, user_id: userId, role, created_at: now });
  await member(painter, 'painter');
  await member(clientUser, 'client');
  await member(client2User, 'client');

  const client = async (row: Record<string, unknown>) => {
    const [r] = await db('clients').insert({ studio_id: studioId, created_at: now, updated_at: now, ...row }).returning('id');
    return typeof r === 'object' ? (r.id as number) : (r as number);
  };
  const c1 = await client({
    user_id: clientUser,
    name: 'Priya Castellane',
    email: 'client@demo.test',
    phone: '+49 30 5550 1234',
    address_line1: 'Lindenhof 14',
    address_city: 'Leipzig',
    address_postal_code: '04109',
    address_country: 'DE',
    notes: 'Collects a swamp-goblin warband. Prefers muted greens and warm bone.',
  });
  const c2 = await client({
    user_id: client2User,
    name: 'Otto Brandvold',
    email: 'client2@demo.test',
    address_line1: 'Havnegata 3',
    address_city: 'Bergen',
    address_postal_code: '5003',
    address_country: 'NO',
    notes: 'Tournament player; needs armies by the date of the event.',
  });
  const walkIn = await client({ name: 'Mara Quillfeather', email: 'mara.q@demo.test', notes: 'Met at the autumn games fair; no account yet.' });

  const ctx: DemoContext = {
    db,
    clock: deps.clock,
    studioId,
    users: { owner, painter, client: clientUser, client2: client2User },
    clients: { client: c1, client2: c2, walkIn },
    photoStorage: deps.photoStorage,
  };
  for (const step of demoSteps) await step(ctx);
  return ctx;
}
