import { html, raw, type Raw } from '../html';

export type Rendered = { subject: string; text: string; html: string };

/** Our mail layout: bone card on primer grey, sable text, verdigris button. */
function layout(title: string, body: Raw, action?: { label: string; url: string }, footer?: string): string {
  const button = action
    ? html`<p style="margin:24px 0"><a href="${action.url}" style="background:#286B5E;color:#FBF8F3;padding:10px 18px;border-radius:6px;text-decoration:none;font-weight:600">${action.label}</a></p>
<p style="font-size:12px;color:#6B4F3F">Or paste this address into your browser: ${action.url}</p>`
    : raw('');
  return html`<!doctype html><html><body style="margin:0;background:#F1EFEC;font-family:Inter,Arial,sans-serif;color:#2B211C">
<div style="max-width:560px;margin:24px auto;background:#FBF8F3;border:1px solid #D6D2CC;border-radius:10px;padding:24px">
<h1 style="font-size:20px;margin:0 0 16px">${title}</h1>${body}${button}
<p style="font-size:12px;color:#6B4F3F;margin-top:32px">${footer ?? 'Sent by Sablework on behalf of your painting studio.'}</p>
</div></body></html>`.value;
}

export const templates = {
  invitation(d: { studioName: string; inviterName: string; role: string; url: string; expiresOn: string }): Rendered {
    const what = d.role === 'client' ? 'follow your commissions' : `join the team as ${d.role}`;
    const subject = `${d.studioName} invites you to ${what} on Sablework`;
    return {
      subject,
      text: `${d.inviterName} at ${d.studioName} invites you to ${what}.\n\nOpen this link to accept (it works once, until ${d.expiresOn}):\n${d.url}\n\nIf you did not expect this, you can ignore this message.`,
      html: layout(
        subject,
        html`<p>${d.inviterName} at <strong>${d.studioName}</strong> invites you to ${what}.</p><p>The link works once, until ${d.expiresOn}.</p>`,
        { label: 'Accept the invitation', url: d.url },
        'If you did not expect this, you can ignore this message.',
      ),
    };
  },
  passwordReset(d: { name: string; url: string }): Rendered {
    const subject = 'Choose a new Sablework password';
    return {
      subject,
      text: `Hello ${d.name},\n\nSomeone asked to reset the password of this account. Open this link within an hour to choose a new one (it works once):\n${d.url}\n\nIf it was not you, ignore this message; your password stays as it is.`,
      html: layout(
        subject,
        html`<p>Hello ${d.name},</p><p>Someone asked to reset the password of this account. The link below works once, for one hour.</p>`,
        { label: 'Choose a new password', url: d.url },
        'If it was not you, ignore this message; your password stays as it is.',
      ),
    };
  },
  /** Generic notice used by later features: a line or two and a link. */
  notice(d: { subject: string; lines: string[]; action?: { label: string; url: string } }): Rendered {
    return {
      subject: d.subject,
      text: [...d.lines, ...(d.action ? ['', `${d.action.label}: ${d.action.url}`] : [])].join('\n'),
      html: layout(d.subject, html`${d.lines.map((l) => html`<p>${l}</p>`)}`, d.action),
    };
  },
};
