// The role × route × studio checks, generated from the router itself: every route sw.routes() lists, with the
// policy it declares (server/lib/policy.ts: publicRoute, signedIn, allow(...roles)). A route added by anyone is
// picked up here without a new line; a route whose parameters this suite has no record for fails loudly
// (tests/support/route-fixtures.ts). tests/api/route-table.test.ts stays the independent, hand-written table.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { Caller, startTestApp, twoStudios, type TestApp } from '../support/app';
import { fill, NON_ID_PARAMS, paramsOf, sampleInputs, studioRecords, type RouteIds, type StudioMembers } from '../support/route-fixtures';
import { call, changes, is2xx, snapshot } from '../support/security';

type Route = ReturnType<TestApp['routes']>[number];
type Who = 'anon' | 'A owner' | 'A painter' | 'A client' | 'B owner' | 'B painter' | 'B client';
const WHO: Who[] = ['anon', 'A owner', 'A painter', 'A client', 'B owner', 'B painter', 'B client'];
const roleOf = (w: Who) => w.split(' ')[1] as 'owner' | 'painter' | 'client';

/** A number no record has (the databases here hold a few dozen rows per table). */
const MISSING = '999999999';

let sw: TestApp;
let A: StudioMembers;
let B: StudioMembers;
let ids: { a: RouteIds; b: RouteIds };
let routes: Route[];
let callers: Record<Who, Caller>;

beforeAll(async () => {
  sw = await startTestApp();
  const s = await twoStudios(sw);
  A = s.a;
  B = s.b;
  ids = { a: await studioRecords(sw, A, 'a'), b: await studioRecords(sw, B, 'b') };
  routes = sw.routes();
  callers = { anon: new Caller(sw.app), 'A owner': A.owner, 'A painter': A.painter, 'A client': A.client, 'B owner': B.owner, 'B painter': B.painter, 'B client': B.client };
}, 180_000);
afterAll(() => sw.stop());

/** Does the route's declared policy let this caller in, on studio A's routes? */
function declaredAllowed(r: Route, w: Who): boolean {
  const p = r.policy!;
  if (p.kind === 'public') return true;
  if (w === 'anon') return false;
  if (p.kind === 'signed-in') return true;
  return w.startsWith('A ') && p.roles.includes(roleOf(w));
}

/** What the policy answers a caller it does not let in: 401 signed out, 404 outside the studio, 403 wrong role. */
const refusal = (w: Who) => (w === 'anon' ? 401 : w.startsWith('B ') ? 404 : 403);

const studioRoutes = () => routes.filter((r) => r.policy?.kind === 'allow');
const label = (r: Route) => `${r.method} ${r.path}`;

describe('every route declares who may call it', () => {
  it('every route declares a policy, every studio route an allow() with roles, and allow() only sits on studio routes', () => {
    expect(routes.length).toBeGreaterThan(0);
    const wrong = routes.filter((r) => {
      if (!r.policy) return true;
      const studio = r.path.includes(':studioId');
      if (studio) return r.policy.kind !== 'allow' || r.policy.roles.length === 0;
      return r.policy.kind === 'allow';
    });
    expect(wrong.map(label)).toEqual([]);
  });

  it('every route parameter has a real record in both studios (a new kind of id must join the fixtures)', () => {
    const missing = routes.flatMap((r) => paramsOf(r.path).filter((p) => ids.a[p] === undefined || ids.b[p] === undefined).map((p) => `${label(r)} :${p}`));
    expect(missing).toEqual([]);
  });
});

describe('role × route × studio, generated from the router', () => {
  it(
    'a caller the declared policy does not let in never gets 2xx: 401 signed out, 403 with another role, 404 from another studio',
    async () => {
      const before = await snapshot(sw);
      const failures: string[] = [];
      const lines: string[] = [];
      let refusedCalls = 0;
      for (const r of routes) {
        const url = fill(r.path, ids.a);
        const cells: string[] = [];
        for (const w of WHO) {
          if (declaredAllowed(r, w)) {
            cells.push('  ✓');
            continue;
          }
          const res = await call(callers[w], r.method, url);
          refusedCalls++;
          cells.push(String(res.status).padStart(3));
          if (res.status !== refusal(w)) failures.push(`${w} ${label(r)} → ${res.status} (expected ${refusal(w)})`);
        }
        lines.push(`${cells.join(' ')}  ${r.policy?.kind === 'allow' ? `allow(${r.policy.roles.join(',')})` : r.policy?.kind}  ${label(r)}`);
      }
      // The matrix, one row per route: ✓ where the declared policy lets the caller in, else the status it got.
      console.log(`${WHO.map((w) => w.padStart(9)).join('')}\n${lines.join('\n')}`);
      expect(refusedCalls).toBeGreaterThan(routes.length);
      expect(failures).toEqual([]);
      expect(changes(before, await snapshot(sw))).toEqual({});
    },
    300_000,
  );
});

describe('foreign ids', () => {
  it(
    "studio B's owner, painter and client get 404 on every studio route with studio A's real ids, and change nothing",
    async () => {
      const before = await snapshot(sw);
      const failures: string[] = [];
      for (const r of studioRoutes()) {
        const url = fill(r.path, ids.a);
        for (const w of ['B owner', 'B painter', 'B client'] as const) {
          const res = await call(callers[w], r.method, url);
          if (res.status !== 404) failures.push(`${w} ${label(r)} → ${res.status}`);
        }
      }
      expect(studioRoutes().length).toBeGreaterThan(0);
      expect(failures).toEqual([]);
      expect(changes(before, await snapshot(sw))).toEqual({});
    },
    300_000,
  );

  it(
    "studio A's members with ids of studio B inside studio A's URL: never 2xx or 500, and the same answer as for an id that does not exist",
    async () => {
      const before = await snapshot(sw);
      const failures: string[] = [];
      const answered: Record<number, number> = {};
      const samples = sampleInputs(ids.a);
      let checked = 0;
      for (const r of studioRoutes()) {
        const idParams = paramsOf(r.path).filter((p) => p !== 'studioId' && !NON_ID_PARAMS.has(p));
        // a valid body (or query), so the call gets past validation to the records, where the route has one
        const sample = samples[label(r)];
        const url = (p: string, v: string) => `${fill(r.path, ids.a, { [p]: v })}${sample?.query ? `?${sample.query}` : ''}`;
        for (const w of ['A owner', 'A painter', 'A client'] as const) {
          if (!r.policy!.roles.includes(roleOf(w))) continue;
          for (const p of idParams) {
            const foreign = await call(callers[w], r.method, url(p, ids.b[p]), sample?.body ?? {});
            const missing = await call(callers[w], r.method, url(p, MISSING), sample?.body ?? {});
            checked++;
            answered[foreign.status] = (answered[foreign.status] ?? 0) + 1;
            const where = `${w} ${label(r)} with B's :${p}`;
            if (is2xx(foreign.status) || foreign.status >= 500) failures.push(`${where} → ${foreign.status}`);
            else if (foreign.status !== missing.status || foreign.body?.error?.code !== missing.body?.error?.code) {
              failures.push(`${where} → ${foreign.status} ${foreign.body?.error?.code}, but a missing id → ${missing.status} ${missing.body?.error?.code}`);
            } else if ((sample || r.method === 'GET' || r.method === 'DELETE') && foreign.status !== 404 && foreign.status !== 403) {
              // no body to fail, or a valid one: the record lookup decides (403 only where the role's own rule does)
              failures.push(`${where} → ${foreign.status} ${JSON.stringify(foreign.body?.error?.fields ?? foreign.body?.error?.message)} (expected 404)`);
            }
          }
        }
      }
      console.log(`foreign ids inside studio A's URLs: ${checked} calls, answered ${JSON.stringify(answered)}`);
      expect(checked).toBeGreaterThan(0);
      expect(failures).toEqual([]);
      expect(changes(before, await snapshot(sw))).toEqual({});
    },
    300_000,
  );
});

describe('guessed ids', () => {
  // 2^31 is one past PostgreSQL's integer; 2^53 one past JavaScript's safe integers.
  const GUESSES = [MISSING, '0', '-1', String(2 ** 31), String(2 ** 53), '1e3', '0x1', 'abc', '..%2Fetc', '..%2F..%2Fetc%2Fpasswd', '%00', "1'%20OR%201=1", '9'.repeat(400), 'a'.repeat(3000)];

  it(
    'every parameter of every route, replaced by a guess, answers 400 or 404: never 2xx, never 500',
    async () => {
      const before = await snapshot(sw);
      const failures: string[] = [];
      let checked = 0;
      for (const r of routes) {
        const p0 = r.policy!;
        // The most privileged caller the route lets in, so the guess meets the route's own code, not the policy.
        const w: Who = p0.kind === 'public' ? 'anon' : p0.kind === 'signed-in' ? 'A owner' : (['A owner', 'A painter', 'A client'] as const).find((x) => p0.roles.includes(roleOf(x)))!;
        for (const p of paramsOf(r.path)) {
          for (const g of GUESSES) {
            const res = await call(callers[w], r.method, fill(r.path, ids.a, { [p]: g }));
            checked++;
            if (res.status !== 400 && res.status !== 404) failures.push(`${w} ${label(r)} :${p}=${g.slice(0, 24)} → ${res.status}`);
          }
        }
      }
      expect(checked).toBeGreaterThan(0);
      expect(failures).toEqual([]);
      expect(changes(before, await snapshot(sw))).toEqual({});
    },
    600_000,
  );
});
