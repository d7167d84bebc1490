import type { Db } from '../../lib/db';
import type { Mailer } from '../../lib/mail/mailer';
import { templates } from '../../lib/mail/templates';
import type { NoticesRepository } from './notices.repository';

export type Notice = {
  studioId: number;
  commissionId: number;
  /** client: the commission's client; studio: owners and the painters assigned to its figures. */
  to: 'client' | 'studio';
  /** The person who caused it hears nothing about their own action. */
  actorId: number;
  template: string;
  subject: (c: { title: string; studioName: string }) => string;
  lines: string[];
};

/** Longest piece of a person's own text (a comment) quoted in a mail. */
const QUOTE_MAX = 600;
export const quote = (text: string) => (text.length > QUOTE_MAX ? `${text.slice(0, QUOTE_MAX - 1)}…` : text);

/**
 * E-mail notices about a commission, queued in the mail outbox inside the caller's transaction (so a
 * rolled-back change sends nothing); call `kick()` after the commit.
 */
export function noticesService(deps: { repo: NoticesRepository; mailer: Mailer; publicUrl: string }) {
  const { repo, mailer, publicUrl } = deps;
  const commissionUrl = (studioId: number, commissionId: number) => `${publicUrl}/studio/${studioId}/commissions/${commissionId}`;
  return {
    commissionUrl,
    /** Queues one mail per recipient; returns how many were queued. */
    async notify(trx: Db, n: Notice): Promise<number> {
      const c = await repo.commission(n.studioId, n.commissionId, trx);
      if (!c) return 0;
      const people = n.to === 'client' ? await repo.clientSide(n.studioId, n.commissionId, trx) : await repo.studioSide(n.studioId, n.commissionId, trx);
      const subject = n.subject({ title: c.title, studioName: c.studio_name });
      let queued = 0;
      for (const p of people) {
        if (p.id === n.actorId) continue;
        const mail = templates.notice({
          subject,
          lines: [`Hello ${p.name},`, ...n.lines],
          action: { label: 'Open the commission', url: commissionUrl(n.studioId, n.commissionId) },
        });
        await mailer.enqueue({ ...mail, to: p.email, template: n.template, studioId: n.studioId }, trx);
        queued++;
      }
      return queued;
    },
    kick: () => mailer.kick(),
  };
}

export type NoticesService = ReturnType<typeof noticesService>;
