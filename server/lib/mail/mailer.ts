import nodemailer, { type Transporter } from 'nodemailer';
import type { Logger } from 'pino';
import type { Clock } from '../clock';
import { addMs, iso } from '../clock';
import type { Db } from '../db';
import type { Rendered } from './templates';

export type OutgoingMail = Rendered & { to: string; template: string; studioId?: number | null };

const MAX_ATTEMPTS = 12;
/**
 * How long a claimed message is left to the process sending it. Several processes (workers, instances) may run
 * a pass at once: each claims a message before it sends it, so one sends it. One that dies mid-send leaves the
 * claim, and the message is sent again after this (at least once, never twice at the same time).
 */
export const SEND_CLAIM_MS = 10 * 60_000;
/** 1, 2, 4 … minutes, capped at an hour: a refusing server is retried for about half a day. */
export const backoffMs = (attempts: number) => Math.min(60, 2 ** Math.max(0, attempts - 1)) * 60_000;

/**
 * Every message goes through the outbox table first, so a refused or failed send is retried later
 * (also after a restart) and nothing is lost. Delivery is at-least-once with a stable Message-ID
 * per outbox row, which lets a receiving server drop a duplicate after a crash between send and mark.
 */
export function createMailer(opts: { db: Db; clock: Clock; smtp: { host: string; port: number } | string; from: string; log: Logger }) {
  const { db, clock, log } = opts;
  const transport: Transporter =
    typeof opts.smtp === 'string'
      ? nodemailer.createTransport(opts.smtp)
      : nodemailer.createTransport({ host: opts.smtp.host, port: opts.smtp.port, secure: false, ignoreTLS: true, connectionTimeout: 5000, greetingTimeout: 5000, socketTimeout: 10000 });

  let running: Promise<number> | null = null;

  async function deliverDueOnce(): Promise<number> {
    const now = iso(clock.now());
    const due = await db('outbox').whereIn('status', ['pending', 'sending']).andWhere('next_attempt_at', '<=', now).orderBy('id').limit(50);
    let sent = 0;
    for (const m of due) {
      const claimed = await db('outbox')
        .where({ id: m.id, status: m.status, next_attempt_at: m.next_attempt_at })
        .update({ status: 'sending', next_attempt_at: iso(addMs(clock.now(), SEND_CLAIM_MS)) });
      if (!claimed) continue; // another process took it since this pass read it
      try {
        await transport.sendMail({
          from: opts.from,
          to: m.to,
          subject: m.subject,
          text: m.text,
          html: m.html,
          messageId: `<outbox-${m.id}-${m.created_at.replace(/[^0-9]/g, '')}@sablework.local>`,
        });
        await db('outbox').where({ id: m.id }).update({ status: 'sent', sent_at: iso(clock.now()), attempts: m.attempts + 1, last_error: null });
        sent++;
      } catch (err) {
        const attempts = m.attempts + 1;
        const message = err instanceof Error ? err.message : String(err);
        log.warn({ outboxId: m.id, attempts, err: message }, 'mail send failed; will retry');
        await db('outbox')
          .where({ id: m.id })
          .update({
            attempts,
            last_error: message.slice(0, 1000),
            status: attempts >= MAX_ATTEMPTS ? 'failed' : 'pending',
            next_attempt_at: iso(addMs(clock.now(), backoffMs(attempts))),
          });
      }
    }
    return sent;
  }

  /** Runs one delivery pass; overlapping calls wait for the pass in flight and then run their own. */
  async function deliverDue(): Promise<number> {
    while (running) await running.catch(() => 0);
    running = deliverDueOnce();
    try {
      return await running;
    } finally {
      running = null;
    }
  }

  return {
    /** Stores the message in the outbox, inside the caller's transaction when one is given. */
    async enqueue(mail: OutgoingMail, trx: Db = db) {
      const now = iso(clock.now());
      const [row] = await trx('outbox')
        .insert({
          studio_id: mail.studioId ?? null,
          to: mail.to,
          subject: mail.subject,
          text: mail.text,
          html: mail.html,
          template: mail.template,
          status: 'pending',
          attempts: 0,
          next_attempt_at: now,
          created_at: now,
        })
        .returning('id');
      return typeof row === 'object' ? row.id : row;
    },
    deliverDue,
    /** Kicks a delivery pass without waiting (after a request has committed its mail). */
    kick() {
      void deliverDue().catch((err) => log.error({ err }, 'mail delivery pass failed'));
    },
    close: () => transport.close(),
  };
}

export type Mailer = ReturnType<typeof createMailer>;
