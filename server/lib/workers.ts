import cluster, { type Worker } from 'node:cluster';
import type { Config, WorkerLink } from '../config';
import type { SableworkApp } from '../app';

/**
 * Several processes on one port (WORKERS > 1, node:cluster): one Node process uses one core, so a machine
 * with more cores serves more at once with a process per core, as instances behind a load balancer do
 * (docs/scaling.md). Nothing a request needs lives in one process's memory alone: sessions, throttles and the
 * outbox are rows, and the kept reads are keyed by versions the database moves (server/lib/version-cache.ts).
 *
 * The primary runs what must run once: the migrations, the demo seed, the start-up sweep of photo leftovers,
 * the background jobs, and (when SMTP_URL or the payment keys are unset) the local mail capture and payment
 * fake. It serves no HTTP itself; the workers do, and reach its capture and fake over 127.0.0.1.
 */

/** The environment variable that carries the primary's WorkerLink to a worker. */
export const WORKER_LINK_ENV = 'SABLEWORK_WORKER_LINK';

/** A worker that stops this soon after it started listening is failing, not crashing now and then. */
const FAILING_WITHIN_MS = 10_000;
/** That many such stops in a row, and the primary stops rather than start it again for ever. */
const FAILING_STOPS = 5;
/** How long a stop waits for workers to finish the requests they have before it ends them. */
const STOP_GRACE_MS = 10_000;

export function workerLink(env: NodeJS.ProcessEnv = process.env): WorkerLink | undefined {
  const raw = env[WORKER_LINK_ENV];
  return raw ? (JSON.parse(raw) as WorkerLink) : undefined;
}

type Log = SableworkApp['log'];

/**
 * The primary: forks `config.workers` workers (each runs the same entry file, which serves when it finds the
 * link in its environment), starts one again when it dies, and stops them all on SIGINT or SIGTERM.
 * A worker that fails before it listens (a taken port, say) stops the whole server with its message.
 */
export function runPrimary(sw: SableworkApp, config: Config, onListening: (port: number) => void) {
  const log: Log = sw.log;
  const link: WorkerLink = {
    ...(sw.mailCapturePort !== null ? { mailCapturePort: sw.mailCapturePort } : {}),
    ...(sw.paymentsFake
      ? { paymentsFake: { host: sw.paymentsFake.host, port: sw.paymentsFake.port, secretKey: sw.paymentsFake.secretKey, webhookSecret: sw.paymentsFake.webhookSecret } }
      : {}),
  };
  // SMTP_URL set by the link would turn the demo default off in the worker: pass the primary's choice on.
  const env = { [WORKER_LINK_ENV]: JSON.stringify(link), DEMO: String(config.demo) };
  const listened = new Map<Worker, number>();
  let stopping = false;
  let announced = false;
  let failingInARow = 0;

  const fork = () => cluster.fork(env);

  // Said once, when every first worker listens (a replacement later says nothing).
  cluster.on('listening', (worker, address) => {
    listened.set(worker, Date.now());
    if (!announced && listened.size === config.workers) {
      announced = true;
      onListening(address.port);
    }
  });

  cluster.on('exit', (worker, code, signal) => {
    const since = listened.get(worker);
    listened.delete(worker);
    if (stopping) return;
    if (since === undefined) {
      log.error(`a worker stopped before it could serve (${signal ?? `exit code ${code}`}); stopping`);
      void stop(1);
      return;
    }
    failingInARow = Date.now() - since < FAILING_WITHIN_MS ? failingInARow + 1 : 0;
    if (failingInARow >= FAILING_STOPS) {
      log.error(`workers keep stopping within ${FAILING_WITHIN_MS / 1000} s of starting; stopping`);
      void stop(1);
      return;
    }
    log.warn(`a worker stopped (${signal ?? `exit code ${code}`}); starting another`);
    fork();
  });

  async function stop(exitCode: number) {
    if (stopping) return;
    stopping = true;
    const workers = Object.values(cluster.workers ?? {}).filter((w): w is Worker => Boolean(w));
    await Promise.all(
      workers.map(
        (w) =>
          new Promise<void>((resolve) => {
            if (w.isDead()) return resolve();
            const hard = setTimeout(() => w.process.kill('SIGKILL'), STOP_GRACE_MS);
            w.once('exit', () => {
              clearTimeout(hard);
              resolve();
            });
            w.process.kill('SIGTERM');
          }),
      ),
    );
    await sw.close();
    process.exit(exitCode);
  }

  for (let i = 0; i < config.workers; i++) fork();
  process.on('SIGINT', () => void stop(0));
  process.on('SIGTERM', () => void stop(0));
}
