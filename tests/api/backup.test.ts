import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { backupDataDir } from '../../server/lib/backup';
import { loadConfig } from '../../server/config';
import { createApp } from '../../server/app';
import { signInAs, signUp, startTestApp } from '../support/app';

describe('backup and restore', () => {
  it('an online backup taken while the app runs restores into a working app with the same data', async () => {
    // The backup copies the SQLite file in DATA_DIR, so this stays on SQLite when DATABASE_URL is set.
    const sw = await startTestApp({ sqlite: true });
    const owner = await signUp(sw, { email: 'backup-owner@example.test', studioName: 'Backed Up' });
    await owner.caller.post(`/api/studios/${owner.studioId}/clients`, { name: 'Kept Client', email: 'kept@example.test' });
    const dest = fs.mkdtempSync(path.join(os.tmpdir(), 'sablework-backup-'));
    const folder = await backupDataDir(sw.dataDir, dest);
    // A write after the backup must not be in it.
    await owner.caller.post(`/api/studios/${owner.studioId}/clients`, { name: 'Later Client' });
    await sw.stop();

    const restored = await startTestApp({ dataDir: folder, sqlite: true });
    const c = await signInAs(restored, 'backup-owner@example.test');
    const list = await c.get(`/api/studios/${owner.studioId}/clients`).expect(200);
    expect(list.body.items.map((x: { name: string }) => x.name)).toEqual(['Kept Client']);
    await restored.stop();
    fs.rmSync(dest, { recursive: true, force: true });
  });

  it('an unwritable DATA_DIR stops start-up with a clear message', async () => {
    const parent = fs.mkdtempSync(path.join(os.tmpdir(), 'sablework-ro-'));
    const file = path.join(parent, 'not-a-folder');
    fs.writeFileSync(file, 'x');
    const config = loadConfig({ DATA_DIR: path.join(file, 'data') }, { logLevel: 'silent', runJobs: false, serveClient: false });
    await expect(createApp(config)).rejects.toThrow(/DATA_DIR .* is not writable/);
    fs.rmSync(parent, { recursive: true, force: true });
  });
});
