// Records and images for the photo, comment and approval tests. Commissions, figures and stages are
// inserted directly (their own API is tested elsewhere); images are made by sharp on the spot.
import fs from 'node:fs';
import path from 'node:path';
import sharp from 'sharp';
import { Caller, PASSWORD, linkIn, mailTo, type TestApp } from './app';

const idOf = (row: unknown) => (typeof row === 'object' && row !== null ? (row as { id: number }).id : (row as number));

export async function insertCommission(sw: TestApp, studioId: number, clientId: number, over: Record<string, unknown> = {}) {
  const now = sw.clock.now().toISOString();
  const [row] = await sw
    .db('commissions')
    .insert({ studio_id: studioId, client_id: clientId, title: 'Swamp goblin warband', status: 'on_bench', priority: 'normal', created_at: now, updated_at: now, ...over })
    .returning('id');
  return idOf(row);
}

/** A figure with two stages; `painterId` assigns it. */
export async function insertFigure(sw: TestApp, studioId: number, commissionId: number, painterId: number | null = null) {
  const now = sw.clock.now().toISOString();
  const [f] = await sw
    .db('figures')
    .insert({ studio_id: studioId, commission_id: commissionId, name: 'Bog shaman', quantity: 1, size_class: '32', tier: 'tabletop', painter_id: painterId, created_at: now, updated_at: now })
    .returning('id');
  const figureId = idOf(f);
  const stageIds: number[] = [];
  for (const [position, key] of ['prime', 'basecoat'].entries()) {
    const [s] = await sw
      .db('stages')
      .insert({ studio_id: studioId, commission_id: commissionId, figure_id: figureId, template_key: key, name: key, position, updated_at: now })
      .returning('id');
    stageIds.push(idOf(s));
  }
  return { figureId, stageIds };
}

export const userId = async (sw: TestApp, email: string) => (await sw.db('users').where({ email }).first('id')).id as number;

/** Another client of the studio, with an account (a real invitation, accepted). */
export async function secondClient(sw: TestApp, owner: Caller, studioId: number, email: string) {
  const cr = await owner.post(`/api/studios/${studioId}/clients`, { name: 'Second Client', email });
  if (cr.status !== 201) throw new Error(JSON.stringify(cr.body));
  await owner.post(`/api/studios/${studioId}/clients/${cr.body.id}/invite`);
  const [m] = await mailTo(sw, email);
  const caller = new Caller(sw.app);
  const res = await caller.post(`/api/invitations/${linkIn(m.text, '/invite/')}/accept`, { name: 'Second Client', password: PASSWORD });
  if (res.status !== 200) throw new Error(JSON.stringify(res.body));
  return { caller, clientId: cr.body.id as number };
}

/** Another painter of the studio, through a real invitation. */
export async function secondPainter(sw: TestApp, owner: Caller, studioId: number, email: string) {
  const inv = await owner.post(`/api/studios/${studioId}/invitations`, { email, role: 'painter' });
  if (inv.status !== 201) throw new Error(JSON.stringify(inv.body));
  const [m] = await mailTo(sw, email);
  const caller = new Caller(sw.app);
  const res = await caller.post(`/api/invitations/${linkIn(m.text, '/invite/')}/accept`, { name: 'Second Painter', password: PASSWORD });
  if (res.status !== 200) throw new Error(JSON.stringify(res.body));
  return caller;
}

export type UploadFile = { data: Buffer; name: string; type?: string };

/** A multipart upload the way the browser sends it: field `photos`, text fields beside it, CSRF header. */
export async function upload(c: Caller, url: string, files: UploadFile[], fields: Record<string, string> = { kind: 'progress' }) {
  const token = await c.csrf();
  let req = c.agent.post(url).set('x-csrf-token', token);
  for (const [k, v] of Object.entries(fields)) req = req.field(k, v);
  for (const f of files) req = req.attach('photos', f.data, { filename: f.name, contentType: f.type ?? 'image/jpeg' });
  return req;
}

export const images = {
  /** A gradient-ish JPEG of the given size: two colour blocks so orientation can be checked. */
  async twoTone(width: number, height: number, format: 'jpeg' | 'png' | 'webp' = 'jpeg') {
    const left = await sharp({ create: { width: Math.ceil(width / 2), height, channels: 3, background: '#c0392b' } }).png().toBuffer();
    const img = sharp({ create: { width, height, channels: 3, background: '#2c6fbb' } }).composite([{ input: left, left: 0, top: 0 }]);
    return img.toFormat(format).toBuffer();
  },
};

/** Every file under DATA_DIR/photos, temp files included, as paths relative to it. */
export function photoFiles(sw: TestApp): string[] {
  const root = path.join(sw.dataDir, 'photos');
  if (!fs.existsSync(root)) return [];
  return (fs.readdirSync(root, { recursive: true }) as string[]).filter((p) => fs.statSync(path.join(root, p)).isFile()).sort();
}
