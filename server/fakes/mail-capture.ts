import { SMTPServer } from 'smtp-server';
import { simpleParser } from 'mailparser';
import type { AddressInfo } from 'node:net';
import type { Logger } from 'pino';
import type { Clock } from '../lib/clock';
import { iso } from '../lib/clock';
import type { Db } from '../lib/db';

/**
 * The local mail inbox: an SMTP server on 127.0.0.1 that stores every message it receives
 * (headers, text, HTML, attachments) in the database for `/dev/mail`. Started only when no SMTP_URL is set.
 */
export async function startMailCapture(opts: { db: Db; clock: Clock; port: number; log: Logger; refuse?: boolean }) {
  const { db, clock, log } = opts;
  const server = new SMTPServer({
    authOptional: true,
    disabledCommands: ['STARTTLS', 'AUTH'],
    logger: false,
    size: 25 * 1024 * 1024,
    onRcptTo(_address, _session, cb) {
      if (opts.refuse) return cb(Object.assign(new Error('Mailbox unavailable (refusing on purpose)'), { responseCode: 450 }));
      cb();
    },
    onData(stream, _session, cb) {
      simpleParser(stream)
        .then(async (mail) => {
          const to = Array.isArray(mail.to) ? mail.to.map((a) => a.text).join(', ') : (mail.to?.text ?? '');
          const headers: Record<string, unknown> = {};
          for (const [k, v] of mail.headers) headers[k] = typeof v === 'object' && v !== null && 'text' in v ? (v as { text: string }).text : v;
          await db.transaction(async (trx) => {
            const [row] = await trx('captured_mail')
              .insert({
                message_id: mail.messageId ?? null,
                from: mail.from?.text ?? null,
                to,
                subject: mail.subject ?? null,
                text: mail.text ?? null,
                html: typeof mail.html === 'string' ? mail.html : null,
                headers: JSON.stringify(headers),
                received_at: iso(clock.now()),
              })
              .returning('id');
            const mailId = typeof row === 'object' ? row.id : row;
            for (const a of mail.attachments) {
              await trx('captured_mail_attachments').insert({
                mail_id: mailId,
                filename: a.filename ?? null,
                content_type: a.contentType,
                size: a.size,
                content: a.content,
              });
            }
          });
          cb();
        })
        .catch((err) => {
          log.error({ err }, 'mail capture could not store a message');
          cb(err);
        });
    },
  });
  server.on('error', (err) => log.error({ err }, 'mail capture error'));
  await new Promise<void>((resolve, reject) => {
    server.once('error', reject);
    server.listen(opts.port, '127.0.0.1', () => resolve());
  });
  const port = (server.server.address() as AddressInfo).port;
  return {
    port,
    close: () => new Promise<void>((resolve) => server.close(() => resolve())),
  };
}
