// The local fake's checkout page: plain HTML, one stylesheet from the same origin, no script at all,
// so a strict Content-Security-Policy holds and the form works as an ordinary POST.
// Colours are Sablework's own tokens (handbook look.md); the wording is ours.
import { formatMoney, fromChargeAmount } from '../../../shared/money';
import { html, raw, type Raw } from '../../lib/html';
import type { FakeSession } from './store';

export const TEST_CARD_OK = '4242424242424242';
export const TEST_CARD_DECLINED = '4000000000000002';

export const CHECKOUT_CSS = `
:root { color-scheme: light; }
* { box-sizing: border-box; }
body { margin: 0; min-height: 100vh; background: #F1EFEC; color: #2B211C;
  font: 16px/1.5 system-ui, -apple-system, "Segoe UI", Roboto, "Helvetica Neue", Arial, sans-serif; }
main { max-width: 440px; margin: 0 auto; padding: 32px 16px; }
.panel { background: #FBF8F3; border: 1px solid #D6D2CC; border-radius: 10px; padding: 24px;
  box-shadow: 0 1px 3px rgba(43, 33, 28, 0.12); }
.badge { display: inline-block; background: #4C5FA3; color: #FFFFFF; font-size: 12px; font-weight: 600;
  padding: 2px 8px; border-radius: 6px; }
h1 { font-size: 20px; margin: 12px 0 4px; }
.muted { color: #6B4F3F; font-size: 14px; margin: 0; }
.amount { font-size: 32px; font-weight: 700; font-variant-numeric: tabular-nums; margin: 12px 0 0; }
.amount .code { font-size: 16px; font-weight: 600; color: #6B4F3F; margin-left: 8px; }
form { margin-top: 24px; display: grid; gap: 16px; }
.row { display: grid; grid-template-columns: 1fr 1fr; gap: 12px; }
label { display: grid; gap: 4px; font-size: 14px; font-weight: 600; }
input { width: 100%; min-width: 0; font: inherit; font-variant-numeric: tabular-nums; padding: 8px 12px; border: 1px solid #D6D2CC;
  border-radius: 6px; background: #FFFFFF; color: #2B211C; }
input:focus-visible, button:focus-visible, a:focus-visible { outline: 2px solid #286B5E; outline-offset: 2px; }
input[aria-invalid="true"] { border-color: #B2432F; }
.field-error { color: #B2432F; font-size: 14px; font-weight: 400; }
button { font: inherit; font-weight: 600; padding: 12px 16px; border: 0; border-radius: 6px; background: #286B5E;
  color: #FFFFFF; cursor: pointer; }
.alert { border: 1px solid #B2432F; border-left-width: 4px; border-radius: 6px; padding: 12px; margin-top: 16px;
  color: #2B211C; background: #FBF8F3; }
.alert strong { color: #B2432F; }
.done { border: 1px solid #286B5E; border-left-width: 4px; border-radius: 6px; padding: 12px; margin-top: 16px;
  background: #DCEFEA; }
.hint { font-size: 14px; color: #6B4F3F; margin: 16px 0 0; }
.hint code { font-variant-numeric: tabular-nums; color: #2B211C; }
a { color: #286B5E; }
.back { display: inline-block; margin-top: 16px; font-size: 14px; }
`;

function amountParts(session: FakeSession): { text: string; code: string | null } {
  const code = session.currency.toUpperCase();
  const text = formatMoney(fromChargeAmount(session.amount_total, code), code, 'en');
  // Money always with its currency (look.md): "$125.00" alone could be any dollar.
  return { text, code: text.includes(code) ? null : code };
}

function amountOf(session: FakeSession): Raw {
  const { text, code } = amountParts(session);
  return code ? html`<span>${text}</span><span class="code">${code}</span>` : html`<span>${text}</span>`;
}

function amountText(session: FakeSession): string {
  const { text, code } = amountParts(session);
  return code ? `${text} ${code}` : text;
}

export type PageState = {
  /** 'declined' after the test decline card; field errors after a typo */
  declined?: boolean;
  fieldErrors?: Partial<Record<'number' | 'expiry' | 'cvc', string>>;
  values?: { expiry?: string };
};

function layout(title: string, body: Raw): string {
  return `<!doctype html>
<html lang="en">
<head>
<meta charset="utf-8">
<meta name="viewport" content="width=device-width, initial-scale=1">
<meta name="robots" content="noindex">
<title>${html`${title}`.value}</title>
<link rel="stylesheet" href="/pay/assets/checkout.css">
</head>
<body><main>${body.value}</main></body>
</html>`;
}

function field(name: 'number' | 'expiry' | 'cvc', label: string, attrs: Raw, error: string | undefined, value = ''): Raw {
  const id = `card-${name}`;
  const errId = `${id}-error`;
  return html`<label for="${id}">${label}
<input id="${id}" name="${name}" value="${value}" required ${attrs}${error ? raw(` aria-invalid="true" aria-describedby="${errId}"`) : raw('')}>
${error ? html`<span class="field-error" id="${errId}">${error}</span>` : raw('')}</label>`;
}

/** The page for an open session: summary, card form, test-card hint and a way back. */
export function checkoutPage(session: FakeSession, lineItems: { name: string }[], state: PageState = {}): string {
  const errs = state.fieldErrors ?? {};
  const description = lineItems.map((l) => l.name).join(' · ');
  const body = html`<div class="panel">
<span class="badge">Test payment · no real card is charged</span>
<h1>${description}</h1>
${session.customer_email ? html`<p class="muted">Receipt to ${session.customer_email}</p>` : raw('')}
<p class="amount" id="amount">${amountOf(session)}</p>
${
  state.declined
    ? html`<div class="alert" role="alert"><strong>Card declined.</strong> Nothing was charged. Check the number or try another card.</div>`
    : raw('')
}
<form method="post" action="/pay/${session.id}" novalidate>
${field('number', 'Card number', raw('inputmode="numeric" autocomplete="cc-number" placeholder="1234 1234 1234 1234" maxlength="23"'), errs.number)}
<div class="row">
${field('expiry', 'Expiry (MM/YY)', raw('inputmode="numeric" autocomplete="cc-exp" placeholder="MM/YY" maxlength="7"'), errs.expiry, state.values?.expiry ?? '')}
${field('cvc', 'Security code', raw('inputmode="numeric" autocomplete="cc-csc" placeholder="3 or 4 digits" maxlength="4"'), errs.cvc)}
</div>
<button type="submit">Pay ${amountText(session)}</button>
</form>
<p class="hint">This is Sablework's local stand-in for the payment service. Test cards: <code>4242 4242 4242 4242</code> pays,
<code>4000 0000 0000 0002</code> is declined; any future expiry and any three digits.</p>
${session.cancel_url ? html`<a class="back" href="${session.cancel_url}">Go back without paying</a>` : raw('')}
</div>`;
  return layout(state.declined ? 'Card declined · test payment' : 'Test payment', body);
}

/** A session that can no longer be paid: already paid, or expired. */
export function closedPage(session: FakeSession): string {
  const paid = session.payment_status === 'paid';
  const back = paid ? session.success_url.replaceAll('{CHECKOUT_SESSION_ID}', session.id) : session.cancel_url;
  const body = html`<div class="panel">
<span class="badge">Test payment</span>
<p class="amount">${amountOf(session)}</p>
${
  paid
    ? html`<div class="done" role="status">This payment is done. Nothing more to pay here.</div>`
    : html`<div class="alert" role="alert"><strong>This checkout has expired.</strong> Go back and start the payment again.</div>`
}
${back ? html`<a class="back" href="${back}">${paid ? 'Return to the studio' : 'Go back'}</a>` : raw('')}
</div>`;
  return layout(paid ? 'Payment done' : 'Checkout expired', body);
}

export function notFoundPage(): string {
  return layout(
    'Checkout not found',
    html`<div class="panel"><h1>We cannot find that checkout.</h1><p class="muted">Go back to the studio and press Pay again.</p></div>`,
  );
}

// ---------------------------------------------------------------------------------------------
// Card checks. The fake takes only the payment service's documented test numbers, so a real card
// number typed here by mistake is refused and never kept (nothing about the card is stored but last4).

function luhn(digits: string): boolean {
  let sum = 0;
  for (let i = 0; i < digits.length; i++) {
    let d = Number(digits[digits.length - 1 - i]);
    if (i % 2 === 1) {
      d *= 2;
      if (d > 9) d -= 9;
    }
    sum += d;
  }
  return sum % 10 === 0;
}

export type CardCheck =
  | { ok: true; outcome: 'paid' | 'declined'; last4: string }
  | { ok: false; fieldErrors: NonNullable<PageState['fieldErrors']> };

export function checkCard(form: { number?: unknown; expiry?: unknown; cvc?: unknown }, now: Date): CardCheck {
  const fieldErrors: NonNullable<PageState['fieldErrors']> = {};
  const number = typeof form.number === 'string' ? form.number.replace(/[\s-]/g, '') : '';
  if (!/^\d{12,19}$/.test(number) || !luhn(number)) {
    fieldErrors.number = 'That card number is incomplete or has a typo. Check the digits.';
  } else if (number !== TEST_CARD_OK && number !== TEST_CARD_DECLINED) {
    fieldErrors.number = 'This test checkout takes test cards only: use 4242 4242 4242 4242.';
  }
  const expiry = typeof form.expiry === 'string' ? form.expiry.replace(/\s/g, '') : '';
  const m = /^(\d{1,2})\/?(\d{2}|\d{4})$/.exec(expiry);
  if (!m || Number(m[1]) < 1 || Number(m[1]) > 12) {
    fieldErrors.expiry = 'Enter the expiry as MM/YY, such as 04/29.';
  } else {
    const year = m[2].length === 2 ? 2000 + Number(m[2]) : Number(m[2]);
    // A card is good to the end of its expiry month (UTC here).
    if (Date.UTC(year, Number(m[1]), 1) <= now.getTime()) fieldErrors.expiry = 'That expiry date has passed. Use a future month.';
  }
  const cvc = typeof form.cvc === 'string' ? form.cvc.trim() : '';
  if (!/^\d{3,4}$/.test(cvc)) fieldErrors.cvc = 'Enter the 3 or 4 digits from the back of the card.';
  if (Object.keys(fieldErrors).length > 0) return { ok: false, fieldErrors };
  return { ok: true, outcome: number === TEST_CARD_OK ? 'paid' : 'declined', last4: number.slice(-4) };
}
