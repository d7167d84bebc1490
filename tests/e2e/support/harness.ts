import { spawn, spawnSync, type ChildProcess } from 'node:child_process';
import fs from 'node:fs';
import net from 'node:net';
import os from 'node:os';
import path from 'node:path';
import { chromium, type Browser, type BrowserContext, type Page } from 'playwright-core';

const root = path.resolve(import.meta.dirname, '../../..');
export const shotsDir = path.join(root, 'tests/e2e/screenshots');

async function freePort() {
  const srv = net.createServer();
  await new Promise<void>((r) => srv.listen(0, '127.0.0.1', () => r()));
  const port = (srv.address() as net.AddressInfo).port;
  await new Promise<void>((r) => srv.close(() => r()));
  return port;
}

function chromiumPath() {
  for (const p of [process.env.CHROMIUM_PATH, '/usr/lib/chromium/chromium', '/usr/bin/chromium', '/usr/bin/chromium-browser']) {
    if (p && fs.existsSync(p)) return p;
  }
  throw new Error("Chromium not found: install Debian's chromium (apt-get install chromium) or set CHROMIUM_PATH.");
}

/** Builds the client once when dist/ is missing, so `npm run test:e2e` works on its own. */
function ensureBuilt() {
  if (fs.existsSync(path.join(root, 'dist/index.html'))) return;
  const r = spawnSync('npx', ['vite', 'build'], { cwd: root, stdio: 'inherit' });
  if (r.status !== 0) throw new Error('vite build failed');
}

export type E2E = { baseUrl: string; browser: Browser; server: ChildProcess; dataDir: string; stop(): Promise<void> };

/** The real server (tsx server/index.ts) on a free port with the demo scenario, and headless Chromium. */
export async function startE2E(): Promise<E2E> {
  ensureBuilt();
  const port = await freePort();
  const dataDir = fs.mkdtempSync(path.join(os.tmpdir(), 'sablework-e2e-'));
  const baseUrl = `http://127.0.0.1:${port}`;
  const server = spawn(process.execPath, ['--import', 'tsx', 'server/index.ts'], {
    cwd: root,
    detached: true,
    stdio: ['ignore', 'pipe', 'pipe'],
    env: { ...process.env, PORT: String(port), DATA_DIR: dataDir, PUBLIC_URL: baseUrl, DEMO: 'true', BCRYPT_ROUNDS: '4', LOG_LEVEL: 'warn', SMTP_URL: '' },
  });
  let output = '';
  server.stdout!.on('data', (d) => (output += d));
  server.stderr!.on('data', (d) => (output += d));
  const deadline = Date.now() + 60_000;
  for (;;) {
    if (server.exitCode !== null) throw new Error(`server exited early:\n${output}`);
    try {
      const res = await fetch(`${baseUrl}/api/health`);
      if (res.ok) break;
    } catch {
      /* not up yet */
    }
    if (Date.now() > deadline) throw new Error(`server did not start in time:\n${output}`);
    await new Promise((r) => setTimeout(r, 200));
  }
  const browser = await chromium.launch({
    executablePath: chromiumPath(),
    headless: true,
    args: ['--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync', '--disable-dev-shm-usage'],
  });
  fs.mkdirSync(shotsDir, { recursive: true });
  return {
    baseUrl,
    browser,
    server,
    dataDir,
    async stop() {
      await browser.close();
      try {
        process.kill(-server.pid!, 'SIGTERM');
      } catch {
        /* already gone */
      }
      await new Promise((r) => setTimeout(r, 300));
      fs.rmSync(dataDir, { recursive: true, force: true });
    },
  };
}

export async function newPage(e2e: E2E, opts: { phone?: boolean } = {}): Promise<{ context: BrowserContext; page: Page }> {
  const context = await e2e.browser.newContext({
    baseURL: e2e.baseUrl,
    viewport: opts.phone ? { width: 390, height: 844 } : { width: 1280, height: 900 },
  });
  const page = await context.newPage();
  page.setDefaultTimeout(15_000);
  return { context, page };
}

export const DEMO_PASSWORD = 'paint-the-bench';

export async function signIn(page: Page, email: string, password = DEMO_PASSWORD) {
  await page.goto('/sign-in');
  await page.getByLabel('E-mail').fill(email);
  await page.getByLabel('Password', { exact: true }).fill(password);
  await page.getByRole('button', { name: /sign in/i }).click();
}

export const shot = (page: Page, name: string) => page.screenshot({ path: path.join(shotsDir, `${name}.png`), fullPage: true });
