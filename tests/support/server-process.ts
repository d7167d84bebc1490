// The real server as a child process (node --import tsx server/index.ts, SQLite in a DATA_DIR, the local mail
// capture and payment fake), and a browser-like caller over real HTTP. Used by the tests that kill, restart or
// fork it (crash.test.ts, workers.test.ts). It loads none of the server into the test process.
import { spawn, type ChildProcess } from 'node:child_process';
import net from 'node:net';
import path from 'node:path';

const root = path.resolve(import.meta.dirname, '../..');

export async function freePort() {
  const srv = net.createServer();
  await new Promise<void>((r) => srv.listen(0, '127.0.0.1', () => r()));
  const port = (srv.address() as net.AddressInfo).port;
  await new Promise<void>((r) => srv.close(() => r()));
  return port;
}

/** One run of the server process on the shared DATA_DIR; a new port each run, so no kept-alive socket of a dead run is reused. */
export class ServerRun {
  child!: ChildProcess;
  base = '';
  output = '';
  private exited!: Promise<void>;

  /** `env`: variables set on top of the defaults below (e.g. WORKERS, or the payment fake's webhook secret). */
  constructor(
    private dataDir: string,
    private env: Record<string, string> = {},
  ) {}

  /**
   * Starts the server and waits until it says it listens on its port (its "running at" line, written once the
   * port is bound) and answers there. A health answer alone could come from another test's server that took the
   * same free port a moment earlier; a port taken that way makes this run exit, and it is tried again on another.
   */
  async start() {
    for (let attempt = 1; ; attempt++) {
      try {
        return await this.startOn(await freePort());
      } catch (err) {
        if (attempt >= 3 || !/EADDRINUSE/.test(this.output)) throw err;
      }
    }
  }

  private async startOn(port: number) {
    this.base = `http://127.0.0.1:${port}`;
    const env: NodeJS.ProcessEnv = {
      ...process.env,
      PORT: String(port),
      HOST: '127.0.0.1',
      DATA_DIR: this.dataDir,
      PUBLIC_URL: this.base,
      DEMO: 'false',
      BCRYPT_ROUNDS: '4',
      // info: the "running at" line start() waits for
      LOG_LEVEL: 'info',
      SMTP_URL: '',
      SESSION_SECRET: 'crash-test-session-secret-0123456789',
      // no key: the local payment fake runs
      STRIPE_SECRET_KEY: '',
      ...this.env,
    };
    // The child runs on SQLite in DATA_DIR, also in a PostgreSQL run of the API suite.
    delete env.DATABASE_URL;
    this.output = '';
    this.child = spawn(process.execPath, ['--import', 'tsx', 'server/index.ts'], { cwd: root, detached: true, stdio: ['ignore', 'pipe', 'pipe'], env });
    this.child.stdout!.on('data', (d) => (this.output += d));
    this.child.stderr!.on('data', (d) => (this.output += d));
    this.exited = new Promise((r) => this.child.once('exit', () => r()));
    const deadline = Date.now() + 45_000;
    for (;;) {
      if (this.child.exitCode !== null) throw new Error(`server exited early:\n${this.output}`);
      try {
        if (this.output.includes(`Sablework is running at ${this.base}`) && (await fetch(`${this.base}/api/health`)).ok) return;
      } catch {
        /* not up yet */
      }
      if (Date.now() > deadline) throw new Error(`server did not start in time:\n${this.output}`);
      await new Promise((r) => setTimeout(r, 100));
    }
  }

  /** SIGKILL to the whole process group, at once: no handler, no flush, no close. */
  kill() {
    try {
      process.kill(-this.child.pid!, 'SIGKILL');
    } catch {
      /* gone already */
    }
  }

  async killed() {
    this.kill();
    await this.exited;
  }

  async stop() {
    if (this.child.exitCode !== null || this.child.signalCode !== null) return;
    process.kill(this.child.pid!, 'SIGTERM');
    const timer = setTimeout(() => this.kill(), 10_000);
    await this.exited;
    clearTimeout(timer);
  }
}

/** A browser-like caller over real HTTP: one session cookie, the CSRF token on unsafe methods. */
export class Http {
  cookie = '';
  token = '';
  constructor(public server: ServerRun) {}

  async send(method: string, url: string, body?: unknown, headers: Record<string, string> = {}) {
    const isForm = body instanceof FormData;
    const res = await fetch(`${this.server.base}${url}`, {
      method,
      headers: {
        ...(this.cookie ? { cookie: this.cookie } : {}),
        ...(method !== 'GET' && this.token ? { 'x-csrf-token': this.token } : {}),
        ...(body !== undefined && !isForm ? { 'content-type': 'application/json' } : {}),
        ...headers,
      },
      body: body === undefined ? undefined : isForm ? body : JSON.stringify(body),
    });
    const sid = res.headers.getSetCookie().find((c) => c.startsWith('sablework.sid='));
    if (sid) this.cookie = sid.split(';')[0];
    return res;
  }

  async json(method: string, url: string, body?: unknown) {
    const res = await this.send(method, url, body);
    const text = await res.text();
    return { status: res.status, body: text ? JSON.parse(text) : null };
  }

  async csrf() {
    this.token = (await this.json('GET', '/api/auth/csrf')).body.token;
  }

  async ok(method: string, url: string, body?: unknown, status = 200) {
    const r = await this.json(method, url, body);
    if (r.status !== status) throw new Error(`${method} ${url}: ${r.status} ${JSON.stringify(r.body)}`);
    return r.body;
  }
}

