// The start-up sweep of the photo folder: what a crash leaves (temp files of a dead upload, files whose
// transaction never committed, files of a deleted row) goes when the app starts again; what a row refers to,
// or a running process may still be writing, stays. tests/api/crash.test.ts shows it after a real SIGKILL.
import { spawnSync } from 'node:child_process';
import crypto from 'node:crypto';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { Caller, signUp, startTestApp } from '../support/app';
import { images, photoFiles, upload } from '../support/fixtures';

const dataDir = fs.mkdtempSync(path.join(os.tmpdir(), 'sablework-sweep-'));
const photosDir = path.join(dataDir, 'photos');
afterAll(() => fs.rmSync(dataDir, { recursive: true, force: true }));

function plant(rel: string, ageMs = 0) {
  const file = path.join(photosDir, rel);
  fs.mkdirSync(path.dirname(file), { recursive: true });
  fs.writeFileSync(file, 'partial bytes');
  if (ageMs) {
    const t = new Date(Date.now() - ageMs);
    fs.utimesSync(file, t, t);
  }
  return rel;
}

describe('photo folder sweep at start-up', () => {
  it('removes temp files no live upload holds and files no row refers to; keeps the rest', async () => {
    const sw = await startTestApp({ dataDir, trustProxy: true });
    const owner = await signUp(sw, { email: 'sweep-owner@demo.test', studioName: 'Sweep Studio' });
    const s = owner.studioId;
    const client = await owner.caller.post(`/api/studios/${s}/clients`, { name: 'Sweep Client', email: 'sweep-client@demo.test' });
    const c = await owner.caller.post(`/api/studios/${s}/commissions`, { clientId: client.body.id, title: 'Reed stalkers' });
    const up = await upload(owner.caller, `/api/studios/${s}/commissions/${c.body.id}/photos`, [{ data: await images.twoTone(300, 200), name: 'kept.jpg' }]);
    expect(up.status).toBe(201);
    // An enquiry's reference photo: its files are referred to by enquiry_photos only.
    const page = await owner.caller.put(`/api/studios/${s}/public-page`, { enabled: true, intro: 'Reeds and more reeds.', turnaroundText: 'A month.', turnaroundSource: 'text' });
    expect(page.status).toBe(200);
    const visitor = new Caller(sw.app);
    const token = await visitor.csrf();
    let req = visitor.agent.post(`/api/public/studios/${page.body.slug}/enquiries`).set('x-csrf-token', token).set('x-forwarded-for', '203.0.113.77');
    const fields = { name: 'Odo Reedsworth', email: 'odo@demo.test', figures: JSON.stringify([{ name: 'Reed stalker', quantity: 2, sizeClass: '32' }]), tier: 'tabletop', extras: '[]', consent: 'true' };
    for (const [k, v] of Object.entries(fields)) req = req.field(k, v);
    const enquiry = await req.attach('photos', await images.twoTone(160, 120), { filename: 'ref.jpg', contentType: 'image/jpeg' });
    expect(enquiry.status, JSON.stringify(enquiry.body)).toBe(201);
    const kept = photoFiles(sw);
    expect(kept.filter((f) => f.endsWith('/thumb.webp'))).toHaveLength(2);
    await sw.stop();

    const dead = spawnSync(process.execPath, ['-e', '']).pid!; // ran and exited: no process has this id now
    const live = process.ppid; // the test runner's parent, running
    const hour = 3600_000;
    const orphanKey = `${s}/${crypto.randomUUID()}`;
    const gone = [
      plant(`.incoming/${dead}-${crypto.randomUUID()}.part`), // a process killed mid-upload
      plant(`.incoming/${process.pid}-${crypto.randomUUID()}.part`), // an earlier process that had this one's id
      plant(`.incoming/${live}-${crypto.randomUUID()}.part`, 2 * hour), // a running process, but hours old
      plant(`.incoming/${crypto.randomUUID()}.part`, 2 * hour), // an old name without a process id
      // renamed to their keys, but the transaction never committed (or the row was deleted before the files)
      ...['original.jpg', 'large.webp', 'medium.webp', 'thumb.webp'].map((f) => plant(`${orphanKey}/${f}`)),
      plant(`999/${crypto.randomUUID()}/original.png`), // a studio that no longer exists
    ];
    const stays = [
      plant(`.incoming/${live}-${crypto.randomUUID()}.part`), // a running process's upload in progress
      plant(`.incoming/${crypto.randomUUID()}.part`), // recent, writer unknown
      plant(`${s}/notes.txt`), // not shaped like a photo key: not ours to judge
      plant(`exports/${crypto.randomUUID()}/client.zip`),
    ];

    const again = await startTestApp({ dataDir });
    const after = photoFiles(again);
    for (const f of gone) expect(after).not.toContain(f);
    expect(after).toEqual([...kept, ...stays].sort());
    // the swept photo folders themselves are gone too
    for (const f of gone.filter((g) => !g.startsWith('.incoming/'))) expect(fs.existsSync(path.dirname(path.join(photosDir, f)))).toBe(false);
    // and the photo that has its row is still served whole
    const c2 = new Caller(again.app);
    await c2.post('/api/auth/login', { email: 'sweep-owner@demo.test', password: 'correct horse battery' });
    const photo = up.body[0] as { urls: Record<string, string> };
    for (const u of Object.values(photo.urls)) expect((await c2.get(u)).status).toBe(200);
    await again.stop();
  });
});
