import cluster from 'node:cluster';
import { createApp } from './app';
import { loadConfig } from './config';
import { runPrimary, workerLink } from './lib/workers';

// Only starts and listens: everything else is in createApp, which the tests use directly. With WORKERS > 1
// this file runs once as the primary and once in each worker (server/lib/workers.ts).
try {
  const base = loadConfig();
  const link = cluster.isWorker ? workerLink() : undefined;
  if (base.workers > 1 && cluster.isPrimary) {
    // The primary: migrations, seed, jobs, the local fakes; the workers serve.
    const sw = await createApp({ ...base, serveClient: false });
    runPrimary(sw, base, (port) => {
      sw.paymentsFake?.setWebhookUrl(`http://${localHost(base.host)}:${port}/api/webhooks/payments`);
      announce(sw, base, `with ${base.workers} worker processes`);
    });
  } else {
    const config = link ? { ...base, worker: link, runJobs: false } : base;
    const sw = await createApp(config);
    const server = sw.app.listen(config.port, config.host, () => {
      if (link) return; // the primary says where it runs
      const address = server.address();
      const port = typeof address === 'object' && address ? address.port : config.port;
      sw.paymentsFake?.setWebhookUrl(`http://${localHost(config.host)}:${port}/api/webhooks/payments`);
      announce(sw, config);
    });
    const stop = () => server.close(() => void sw.close().then(() => process.exit(0)));
    process.on('SIGTERM', stop);
    if (link) {
      // Ctrl-C reaches every process of the group: the primary stops the workers in turn. A worker whose
      // primary is gone (killed) stops too rather than serve on alone.
      process.on('SIGINT', () => undefined);
      process.on('disconnect', stop);
    } else process.on('SIGINT', stop);
  }
} catch (err) {
  console.error(err instanceof Error ? err.message : err);
  process.exit(1);
}

function localHost(host: string) {
  return host === '0.0.0.0' || host === '::' ? '127.0.0.1' : host;
}

function announce(sw: Awaited<ReturnType<typeof createApp>>, config: ReturnType<typeof loadConfig>, how = '') {
  sw.log.info(`Sablework is running at ${config.publicUrl}${how ? ` ${how}` : ''}`);
  if (sw.paymentsFake) sw.log.info(`Local payment fake: ${sw.paymentsFake.url} (test cards: 4242 4242 4242 4242 pays, 4000 0000 0000 0002 is declined)`);
  if (sw.mailCapturePort) sw.log.info(`Local mail inbox: ${config.publicUrl}/dev/mail (SMTP on 127.0.0.1:${sw.mailCapturePort})`);
}
