import { createApp } from './app';
import { loadConfig } from './config';

// Only listens: everything else is in createApp, which the tests use directly.
try {
  const config = loadConfig();
  const sw = await createApp(config);
  const server = sw.app.listen(config.port, config.host, () => {
    const address = server.address();
    const port = typeof address === 'object' && address ? address.port : config.port;
    const host = config.host === '0.0.0.0' || config.host === '::' ? '127.0.0.1' : config.host;
    sw.paymentsFake?.setWebhookUrl(`http://${host}:${port}/api/webhooks/payments`);
    sw.log.info(`Sablework is running at ${config.publicUrl}`);
    if (sw.paymentsFake) sw.log.info(`Local payment fake: ${sw.paymentsFake.url} (test cards: 4242 4242 4242 4242 pays, 4000 0000 0000 0002 is declined)`);
    if (sw.mailCapturePort) sw.log.info(`Local mail inbox: ${config.publicUrl}/dev/mail (SMTP on 127.0.0.1:${sw.mailCapturePort})`);
  });
  const stop = () => server.close(() => void sw.close().then(() => process.exit(0)));
  process.on('SIGINT', stop);
  process.on('SIGTERM', stop);
} catch (err) {
  console.error(err instanceof Error ? err.message : err);
  process.exit(1);
}
