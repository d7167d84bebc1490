import type { ModelsIn, ModelsInInput, ModelsNoticeInput } from '../../../shared/schemas/shipments';
import { iso, type Clock } from '../../lib/clock';
import type { Db } from '../../lib/db';
import { errors } from '../../lib/errors';
import type { Mailer } from '../../lib/mail/mailer';
import { templates } from '../../lib/mail/templates';
import type { CommissionRef, FigureCheckRow, ModelsInRepository, ModelsInRow } from './models-in.repository';

type Actor = { studioId: number; userId: number };
type Activity = { record(trx: Db, e: { studioId: number; commissionId: number; userId: number | null; action: string; detail?: Record<string, unknown> }): Promise<unknown> };

const plural = (n: number, one: string, many = `${one}s`) => `${n} ${n === 1 ? one : many}`;

function tally(figures: FigureCheckRow[]) {
  let missing = 0;
  let damaged = 0;
  for (const f of figures) {
    missing += Math.max(0, f.quantity - (f.received ?? 0));
    if (f.damaged) damaged++;
  }
  return { missing, damaged };
}

/** "Sunday 25 October 2026": a calendar day, read at noon UTC so no timezone moves it. */
const longDay = (d: string) => new Intl.DateTimeFormat('en-GB', { weekday: 'long', day: 'numeric', month: 'long', year: 'numeric', timeZone: 'UTC' }).format(new Date(`${d}T12:00:00Z`));

/** What the note to the client could say: what is missing, what is damaged, and what happens next. */
function noticeDraft(c: CommissionRef, row: ModelsInRow | undefined, figures: FigureCheckRow[]) {
  const short = figures.filter((f) => (f.received ?? 0) < f.quantity).map((f) => `${f.name} (${f.quantity - (f.received ?? 0)} of ${f.quantity})`);
  const broken = figures.filter((f) => f.damaged).map((f) => (f.note ? `${f.name} (${f.note})` : f.name));
  return [
    `Hello ${c.client_name},`,
    `Your models for "${c.title}" arrived${row?.received_on ? ` on ${longDay(row.received_on)}` : ''}, and we checked them against the figure list.`,
    ...(short.length ? [`Not in the parcel: ${short.join('; ')}.`] : []),
    ...(broken.length ? [`Damaged on arrival: ${broken.join('; ')}.`] : []),
    ...(!short.length && !broken.length ? ['Everything on the list is here and in good shape.'] : []),
    'Photos of how they arrived are with the commission. Let us know how you would like to go on.',
    `${c.studio_name}`,
  ].join('\n\n');
}

export function modelsInService(deps: { db: Db; repo: ModelsInRepository; activity: Activity; mailer: Mailer; clock: Clock; publicUrl: string }) {
  const { db, repo, activity, mailer, clock } = deps;
  const now = () => iso(clock.now());

  async function commission(studioId: number, commissionId: number, trx: Db = db) {
    const c = await repo.commission(studioId, commissionId, trx);
    if (!c) throw errors.notFound('That commission');
    return c;
  }

  async function get(actor: Actor, commissionId: number): Promise<ModelsIn> {
    const c = await commission(actor.studioId, commissionId);
    const [row, figures] = await Promise.all([repo.get(actor.studioId, commissionId), repo.figures(actor.studioId, commissionId)]);
    const { missing, damaged } = tally(figures);
    return {
      commissionId,
      recorded: Boolean(row),
      supplier: row?.supplier ?? 'client_ships',
      retailer: row?.retailer ?? null,
      expectedOn: row?.expected_on ?? null,
      receivedOn: row?.received_on ?? null,
      carrier: row?.carrier ?? null,
      tracking: row?.tracking ?? null,
      note: row?.note ?? null,
      figures: figures.map((f) => ({ figureId: f.figure_id, name: f.name, quantity: f.quantity, received: f.received ?? 0, damaged: Boolean(f.damaged), note: f.note })),
      complete: figures.length > 0 && missing === 0 && damaged === 0,
      missing,
      damaged,
      noticeSentAt: row?.notice_sent_at ?? null,
      noticeDraft: noticeDraft(c, row, figures),
      updatedAt: row?.updated_at ?? null,
    };
  }

  return {
    get,

    /** Records who supplies the models, the parcel, and per figure how many arrived and whether any is damaged. */
    async save(actor: Actor, commissionId: number, input: ModelsInInput) {
      await db.transaction(async (trx) => {
        await commission(actor.studioId, commissionId, trx);
        const figures = await repo.figures(actor.studioId, commissionId, trx);
        const byId = new Map(figures.map((f) => [f.figure_id, f]));
        const fields: Record<string, string> = {};
        input.figures.forEach((f, i) => {
          const known = byId.get(f.figureId);
          if (!known) fields[`figures.${i}.figureId`] = 'That figure is not part of this commission.';
          else if (f.received > known.quantity) fields[`figures.${i}.received`] = `The commission lists ${known.quantity}; record extra models in the note.`;
        });
        if (Object.keys(fields).length) throw errors.invalid('Some fields need a look.', fields);
        const t = now();
        await repo.save(
          trx,
          actor.studioId,
          commissionId,
          {
            supplier: input.supplier,
            retailer: input.supplier === 'retailer' ? (input.retailer ?? null) : null,
            expected_on: input.expectedOn ?? null,
            received_on: input.receivedOn ?? null,
            carrier: input.carrier ?? null,
            tracking: input.tracking ?? null,
            note: input.note ?? null,
            updated_by: actor.userId,
            updated_at: t,
          },
          input.figures.map((f) => ({ figure_id: f.figureId, received: f.received, damaged: f.damaged, note: f.note ?? null })),
        );
        const after = tally(await repo.figures(actor.studioId, commissionId, trx));
        const total = figures.reduce((n, f) => n + f.quantity, 0);
        await activity.record(trx, {
          studioId: actor.studioId,
          commissionId,
          userId: actor.userId,
          action: 'models.recorded',
          detail: {
            missing: after.missing,
            damaged: after.damaged,
            summary: `recorded the models received: ${total - after.missing} of ${total} arrived${after.damaged ? `, ${plural(after.damaged, 'figure')} damaged` : ''}.`,
          },
        });
      });
      return get(actor, commissionId);
    },

    /** E-mails the client the studio's note about missing or damaged models (to the client record's address). */
    async notify(actor: Actor, commissionId: number, input: ModelsNoticeInput) {
      const c = await commission(actor.studioId, commissionId);
      if (!(await repo.get(actor.studioId, commissionId))) throw errors.conflict('Record what arrived first, then write to the client.', 'not_recorded');
      const to = c.client_email ?? c.account_email;
      if (!to) throw errors.conflict(`${c.client_name} has no e-mail address; add one to the client first.`, 'no_email');
      await db.transaction(async (trx) => {
        const mail = templates.notice({
          subject: `${c.studio_name}: your models for "${c.title}"`,
          lines: input.message.split('\n').map((l) => l.trim()).filter(Boolean),
          action: { label: 'Open the commission', url: `${deps.publicUrl}/studio/${actor.studioId}/commissions/${commissionId}` },
        });
        await mailer.enqueue({ ...mail, to, template: 'models.notice', studioId: actor.studioId }, trx);
        await repo.markNoticeSent(trx, actor.studioId, commissionId, now());
        await activity.record(trx, { studioId: actor.studioId, commissionId, userId: actor.userId, action: 'models.notice', detail: { summary: 'wrote to the client about the models that arrived.' } });
      });
      mailer.kick();
      return get(actor, commissionId);
    },
  };
}

export type ModelsInService = ReturnType<typeof modelsInService>;
