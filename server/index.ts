import { createApp } from './app';
import { loadConfig } from './config';

// Only listens: everything else is in createApp, which the tests use directly.
try {
  const config = loadConfig();
  const sw = await createApp(config);
  const server = sw.app.listen(config.port, config.host, () => {
    sw.log.info(`Sablework is running at ${config.publicUrl}`);
    if (sw.mailCapturePort) sw.log.info(`Local mail inbox: ${config.publicUrl}/dev/mail (SMTP on 127.0.0.1:${sw.mailCapturePort})`);
  });
  const stop = () => server.close(() => void sw.close().then(() => process.exit(0)));
  process.on('SIGINT', stop);
  process.on('SIGTERM', stop);
} catch (err) {
  console.error(err instanceof Error ? err.message : err);
  process.exit(1);
}
