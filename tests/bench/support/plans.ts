import Database from 'better-sqlite3';
import path from 'node:path';
import request from 'supertest';
import { createApp } from '../../../server/app';
import { loadConfig } from '../../../server/config';

export type Who = 'owner' | 'client' | 'feed';
export type Endpoint = { name: string; path: string; who: Who };
export type PlanRow = { name: string; queries: number; scans: string[] };

/** Tables that grow with a studio's work: a full scan of one of them is what an index should prevent. */
const growing = new Set([
  'activity',
  'approvals',
  'clients',
  'comments',
  'commissions',
  'enquiries',
  'enquiry_figures',
  'figures',
  'invitations',
  'invoice_payments',
  'invoices',
  'memberships',
  'paints',
  'photos',
  'quotes',
  'recipe_step_paints',
  'recipe_steps',
  'recipes',
  'sessions',
  'stages',
  'time_entries',
  'users',
]);

/**
 * Asks every endpoint once through the app itself (in this process, on the generated database), records
 * each SQL statement it runs with its bindings, and has SQLite explain its plan: any full scan of a
 * growing table (`SCAN stages`, with or without an index) is reported.
 */
export async function queryPlans(dataDir: string, endpoints: Endpoint[], password: string, emails: { owner: string; client: string }): Promise<PlanRow[]> {
  const sw = await createApp(loadConfig({ DATA_DIR: dataDir }, { logLevel: 'silent', runJobs: false, serveClient: false, demo: false }));
  const explain = new Database(path.join(dataDir, 'sablework.sqlite'), { readonly: true });
  try {
    const signIn = async (email: string) => {
      const agent = request.agent(sw.app);
      const { token } = (await agent.get('/api/auth/csrf')).body as { token: string };
      const res = await agent.post('/api/auth/login').set('x-csrf-token', token).send({ email, password });
      if (res.status !== 200) throw new Error(`sign-in ${email}: ${res.status}`);
      return agent;
    };
    const agents = { owner: await signIn(emails.owner), client: await signIn(emails.client) };
    const { token } = (await agents.owner.get('/api/auth/csrf')).body as { token: string };
    const feed = await agents.owner.post('/api/studios/1/calendar-feed').set('x-csrf-token', token);
    const feedPath = new URL((feed.body as { url: string }).url).pathname;

    const rows: PlanRow[] = [];
    for (const e of endpoints) {
      const seen: { sql: string; bindings: unknown[] }[] = [];
      const onQuery = (q: { sql: string; bindings?: unknown[] }) => seen.push({ sql: q.sql, bindings: q.bindings ?? [] });
      sw.db.on('query', onQuery);
      try {
        const res = e.who === 'feed' ? await request(sw.app).get(feedPath) : await agents[e.who].get(e.path);
        if (res.status !== 200) throw new Error(`${e.name}: ${res.status}`);
      } finally {
        sw.db.off('query', onQuery);
      }
      const scans = new Set<string>();
      for (const q of seen) {
        const bindings = q.bindings.map((b) => (b instanceof Date ? b.valueOf() : typeof b === 'boolean' ? Number(b) : b));
        for (const step of explain.prepare(`explain query plan ${q.sql}`).all(...bindings) as { detail: string }[]) {
          const table = /^SCAN (\w+)/.exec(step.detail)?.[1];
          if (table && growing.has(table)) scans.add(step.detail);
        }
      }
      rows.push({ name: e.name, queries: seen.length, scans: [...scans] });
    }
    return rows;
  } finally {
    explain.close();
    await sw.close();
  }
}
