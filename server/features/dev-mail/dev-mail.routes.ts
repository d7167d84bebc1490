import { Router } from 'express';
import type { Db } from '../../lib/db';
import { escapeHtml, html, raw, type Raw } from '../../lib/html';

/** Makes plain-text links clickable in the captured message view. */
const linkify = (text: string) =>
  escapeHtml(text).replace(/https?:\/\/[^\s<]+/g, (u) => `<a href="${u}">${u}</a>`);

function page(title: string, body: Raw) {
  return html`<!doctype html><html lang="en"><head><meta charset="utf-8"><meta name="viewport" content="width=device-width,initial-scale=1">
<title>${title} · Sablework local mail</title>
<style>
body{margin:0;font-family:Inter,system-ui,sans-serif;background:#F1EFEC;color:#2B211C}
main{max-width:900px;margin:0 auto;padding:16px}
a{color:#286B5E} a:focus-visible{outline:2px solid #286B5E;outline-offset:2px}
table{width:100%;border-collapse:collapse;background:#FBF8F3;border:1px solid #D6D2CC;border-radius:10px}
td,th{padding:8px;border-bottom:1px solid #D6D2CC;text-align:left;font-size:14px}
pre{white-space:pre-wrap;background:#FBF8F3;border:1px solid #D6D2CC;border-radius:10px;padding:16px}
.note{font-size:12px;color:#6B4F3F}
</style></head><body><main>${body}</main></body></html>`.value;
}

/** `/dev/mail`: the local inbox, mounted only while the capture SMTP server runs. */
export function devMailRouter(db: Db) {
  const r = Router();
  r.get('/', async (_req, res) => {
    const rows = await db('captured_mail').orderBy('id', 'desc').limit(200).select('id', 'to', 'subject', 'received_at');
    res.type('html').send(
      page(
        'Inbox',
        html`<h1>Local mail inbox</h1><p class="note">Messages the app sent while running without SMTP_URL. Nothing here left this machine.</p>
${rows.length === 0 ? html`<p>No messages yet.</p>` : raw('')}
<table><thead><tr><th>To</th><th>Subject</th><th>Received (UTC)</th></tr></thead><tbody>
${rows.map((m) => html`<tr><td>${m.to}</td><td><a href="/dev/mail/${m.id}">${m.subject || '(no subject)'}</a></td><td>${m.received_at}</td></tr>`)}
</tbody></table>`,
      ),
    );
  });
  r.get('/:id', async (req, res) => {
    const m = await db('captured_mail').where({ id: Number(req.params.id) || 0 }).first();
    if (!m) return res.status(404).type('html').send(page('Not found', html`<p>No such message. <a href="/dev/mail">Back to the inbox</a></p>`));
    const attachments = await db('captured_mail_attachments').where({ mail_id: m.id }).select('id', 'filename', 'size');
    res.type('html').send(
      page(
        m.subject ?? 'Message',
        html`<p><a href="/dev/mail">← Inbox</a></p><h1>${m.subject}</h1>
<p class="note">From ${m.from} · To ${m.to} · ${m.received_at}</p>
${m.html ? html`<p><a href="/dev/mail/${m.id}/html">View the HTML part</a></p>` : raw('')}
${attachments.map((a) => html`<p><a href="/dev/mail/${m.id}/attachments/${a.id}">${a.filename ?? 'attachment'}</a> (${a.size} bytes)</p>`)}
<pre>${raw(linkify(m.text ?? ''))}</pre>`,
      ),
    );
  });
  r.get('/:id/html', async (req, res) => {
    const m = await db('captured_mail').where({ id: Number(req.params.id) || 0 }).first('html');
    if (!m?.html) return res.status(404).end();
    // The captured HTML is shown as sent, sandboxed: no scripts, no forms, links still followable.
    res.set('Content-Security-Policy', "sandbox allow-top-navigation-by-user-activation allow-popups; default-src 'none'; img-src data: 'self'; style-src 'unsafe-inline'");
    res.type('html').send(m.html);
  });
  r.get('/:id/attachments/:aid', async (req, res) => {
    const a = await db('captured_mail_attachments').where({ mail_id: Number(req.params.id) || 0, id: Number(req.params.aid) || 0 }).first();
    if (!a) return res.status(404).end();
    res.set('Content-Disposition', `attachment; filename="${String(a.filename ?? 'attachment').replace(/[^\w.-]/g, '_')}"`);
    res.type(a.content_type ?? 'application/octet-stream').send(a.content);
  });
  return r;
}
