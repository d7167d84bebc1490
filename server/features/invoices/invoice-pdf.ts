// The invoice as a PDF (pdfkit), set in Inter from the @fontsource/inter package (SIL Open Font License 1.1).
// fontkit cannot subset the variable or WOFF2 builds of Inter, so the static WOFF files are used, one per
// Unicode subset (Latin, Latin Extended, Cyrillic, Greek); text switches file where a character needs it.
import { createRequire } from 'node:module';
import PDFDocument from 'pdfkit';
import { formatMoney } from '../../../shared/money';
import { formatBasisPoints } from '../../../shared/pricing';
import { invoiceKindLabels, invoiceStatusLabels, type Invoice } from '../../../shared/schemas/invoices';

const require = createRequire(import.meta.url);
/** Inter's subsets in the order a character is looked up; each is one WOFF file per weight. */
const SUBSETS = ['latin', 'latin-ext', 'cyrillic', 'greek'] as const;
type Subset = (typeof SUBSETS)[number];
const unicodeRanges = require('@fontsource/inter/unicode.json') as Record<string, string>;
const coverage: Record<Subset, [number, number][]> = Object.fromEntries(
  SUBSETS.map((sub) => [
    sub,
    unicodeRanges[sub].split(',').map((r) => {
      const [a, b] = r.replace(/U\+/g, '').split('-');
      return [parseInt(a, 16), parseInt(b ?? a, 16)] as [number, number];
    }),
  ]),
) as Record<Subset, [number, number][]>;
const subsetOf = (cp: number): Subset => SUBSETS.find((sub) => coverage[sub].some(([a, b]) => cp >= a && cp <= b)) ?? 'latin';
const fontFile = (sub: Subset, weight: 400 | 700) => require.resolve(`@fontsource/inter/files/inter-${sub}-${weight}-normal.woff`);
const fontName = (sub: Subset, bold: boolean) => `Inter-${sub}-${bold ? 700 : 400}`;

/**
 * Invisible format characters (bidirectional controls, zero-width spaces, soft hyphens: Unicode's Cf)
 * are left out: pdfkit applies no bidirectional reordering and Inter has no glyphs for them, so they
 * would print as blank boxes that the line wrapping does not count.
 */
const printable = (s: string) => s.replace(/\p{Cf}/gu, '');

/** Splits text into runs that one subset file covers (a name like "Łucja Wrzos" needs two). */
function runs(text: string): { text: string; subset: Subset }[] {
  const out: { text: string; subset: Subset }[] = [];
  for (const ch of printable(text)) {
    const sub = subsetOf(ch.codePointAt(0)!);
    const last = out.at(-1);
    if (last && (last.subset === sub || /\s/.test(ch))) last.text += ch;
    else out.push({ text: ch, subset: sub });
  }
  return out.length ? out : [{ text: '', subset: 'latin' }];
}

// Our own plain look: sable ink on white, a verdigris rule.
const INK = '#2B211C';
const MUTED = '#6B4F3F';
const RULE = '#286B5E';

export type InvoiceDocument = {
  invoice: Invoice;
  studio: { name: string };
  client: { name: string; email: string | null; address_line1: string | null; address_line2: string | null; address_city: string | null; address_region: string | null; address_postal_code: string | null; address_country: string | null } | undefined;
  creditForNumber: string | null;
};


export function invoicePdf(d: InvoiceDocument): Promise<Buffer> {
  const inv = d.invoice;
  const money = (m: number) => formatMoney(m, inv.currency, 'en');
  const doc = new PDFDocument({ size: 'A4', margin: 50, info: { Title: `${invoiceKindLabels[inv.kind]} ${inv.number ?? '(draft)'}`, Author: d.studio.name, Creator: 'Sablework' } });
  for (const sub of SUBSETS) for (const bold of [false, true]) doc.registerFont(fontName(sub, bold), fontFile(sub, bold ? 700 : 400));

  const chunks: Buffer[] = [];
  doc.on('data', (c: Buffer) => chunks.push(c));
  const done = new Promise<Buffer>((resolve, reject) => {
    doc.on('end', () => resolve(Buffer.concat(chunks)));
    doc.on('error', reject);
  });

  const left = doc.page.margins.left;
  const width = doc.page.width - left - doc.page.margins.right;
  type TextOpts = PDFKit.Mixins.TextOptions & { bold?: boolean; size?: number; color?: string };
  /** Writes text at (x, y), switching Inter's subset files mid-string where a character needs another one. */
  const text = (s: string, x: number, y: number, opts: TextOpts = {}) => {
    const { bold = false, size = 10, color = INK, ...rest } = opts;
    const parts = runs(s);
    doc.fontSize(size).fillColor(color);
    parts.forEach((p, i) => {
      doc.font(fontName(p.subset, bold));
      const o = { lineBreak: false, ...rest, continued: i < parts.length - 1 };
      if (i === 0) doc.text(p.text, x, y, o);
      else doc.text(p.text, o);
    });
  };
  /** Height of wrapped text (measured in the main subset; other subsets have the same metrics). */
  const heightOf = (s: string, w: number, size = 10, bold = false) => doc.font(fontName('latin', bold)).fontSize(size).heightOfString(printable(s), { width: w });

  // Header: studio and document. Names and addresses wrap within their column rather than run off it
  // or under the next row: a legal document shows every word of them.
  const nameHeight = Math.max(22, heightOf(d.studio.name, width, 18, true));
  text(d.studio.name, left, 50, { bold: true, size: 18, width, lineBreak: true });
  const titleY = 50 + nameHeight + 8;
  const title = `${invoiceKindLabels[inv.kind]}${inv.number ? ` ${inv.number}` : ' (draft)'}`;
  text(title, left, titleY, { size: 13, bold: true, color: RULE });
  doc.moveTo(left, titleY + 22).lineTo(left + width, titleY + 22).lineWidth(1.5).strokeColor(RULE).stroke();

  // Who and when
  let y = titleY + 35;
  text('Billed to', left, y, { size: 9, color: MUTED });
  const c = d.client;
  const addressLines = c
    ? [c.name, c.address_line1, c.address_line2, [c.address_postal_code, c.address_city].filter(Boolean).join(' '), [c.address_region, c.address_country].filter(Boolean).join(', '), c.email].filter((l): l is string => Boolean(l))
    : [inv.client.name];
  const addressWidth = width / 2 - 10;
  let addressY = y + 14;
  addressLines.forEach((l, i) => {
    text(l, left, addressY, { bold: i === 0, width: addressWidth, lineBreak: true });
    addressY += Math.max(14, heightOf(l, addressWidth, 10, i === 0));
  });
  const facts: [string, string][] = [
    ['Status', invoiceStatusLabels[inv.status]],
    ['Issued', inv.issuedAt ? inv.issuedAt.slice(0, 10) : 'not yet'],
    ...(inv.dueDate ? ([['Due', inv.dueDate]] as [string, string][]) : []),
    ['Commission', inv.commissionTitle],
    ...(d.creditForNumber ? ([['Credits invoice', d.creditForNumber]] as [string, string][]) : []),
    ...(inv.taxId ? ([[`${inv.taxLabel} ID`, inv.taxId]] as [string, string][]) : []),
  ];
  const factX = left + width / 2 + 20;
  const factWidth = width / 2 - 110;
  let factY = y;
  for (const [k, v] of facts) {
    text(k, factX, factY, { size: 9, color: MUTED, width: 85, lineBreak: true });
    text(v, factX + 90, factY, { width: factWidth, lineBreak: true });
    factY += Math.max(14, heightOf(k, 85, 9), heightOf(v, factWidth));
  }
  y = Math.max(addressY, factY) + 24;

  // Lines
  const col = { desc: left, qty: left + width - 250, unit: left + width - 200, rate: left + width - 125, amount: left + width - 80 };
  const header = (yy: number) => {
    text('Description', col.desc, yy, { size: 9, color: MUTED });
    text('Qty', col.qty, yy, { size: 9, color: MUTED, width: 40, align: 'right' });
    text('Unit', col.unit, yy, { size: 9, color: MUTED, width: 70, align: 'right' });
    text(inv.taxLabel, col.rate, yy, { size: 9, color: MUTED, width: 40, align: 'right' });
    text('Amount', col.amount, yy, { size: 9, color: MUTED, width: 80, align: 'right' });
    doc.moveTo(left, yy + headerHeight - 8).lineTo(left + width, yy + headerHeight - 8).lineWidth(0.5).strokeColor(MUTED).stroke();
  };
  // The tax column's heading is the studio's own label, which may wrap in its narrow column.
  const headerHeight = Math.max(14, heightOf(inv.taxLabel, 40, 9)) + 8;
  header(y);
  y += headerHeight;
  for (const l of inv.lines) {
    const h = Math.max(14, heightOf(l.description, col.qty - col.desc - 10));
    if (y + h > doc.page.height - 180) {
      doc.addPage();
      y = 50;
      header(y);
      y += headerHeight;
    }
    text(l.description, col.desc, y, { width: col.qty - col.desc - 10, lineBreak: true });
    text(String(l.quantity), col.qty, y, { width: 40, align: 'right' });
    text(money(l.unitMinor), col.unit, y, { width: 70, align: 'right' });
    text(formatBasisPoints(l.taxBp), col.rate, y, { width: 40, align: 'right' });
    text(money(l.amountMinor), col.amount, y, { width: 80, align: 'right' });
    y += h + 6;
  }
  doc.moveTo(left, y).lineTo(left + width, y).lineWidth(0.5).strokeColor(MUTED).stroke();
  y += 10;

  // Totals
  const rates = [...new Set(inv.lines.map((l) => l.taxBp))].filter((r) => r > 0).map(formatBasisPoints).join(', ');
  const taxLine = inv.taxInclusive ? `Includes ${inv.taxLabel}${rates ? ` (${rates})` : ''}` : `${inv.taxLabel}${rates ? ` (${rates})` : ''}`;
  const totals: [string, string, boolean][] = [
    [inv.taxInclusive ? 'Total of lines' : 'Subtotal', money(inv.subtotal), false],
    [taxLine, money(inv.tax), false],
    ['Total', money(inv.total), true],
  ];
  if (inv.kind !== 'credit_note') {
    totals.push(['Paid', money(inv.paid), false]);
    if (inv.credited) totals.push(['Credited', money(inv.credited), false]);
    totals.push(['Balance due', money(inv.balanceDue), true]);
  }
  for (const [k, v, bold] of totals) {
    text(k, col.qty - 120, y, { width: 200, align: 'right', bold, color: bold ? INK : MUTED });
    text(v, col.amount - 20, y, { width: 100, align: 'right', bold });
    y += Math.max(16, heightOf(k, 200, 10, bold) + 2);
  }

  // Payments
  if (inv.payments.length) {
    y += 14;
    text('Payments', left, y, { bold: true });
    y += 16;
    for (const p of inv.payments) {
      const method = { card: 'Card', bank: 'Bank transfer', cash: 'Cash', other: 'Other' }[p.method];
      const extra = p.refundedMinor ? ` (refunded ${money(p.refundedMinor)})` : '';
      const line = `${p.receivedAt.slice(0, 10)}  ${method}${p.reference && p.method !== 'card' ? ` · ${p.reference}` : ''}${extra}`;
      text(line, left, y, { width: width - 110, lineBreak: true });
      text(money(p.amountMinor), col.amount - 20, y, { width: 100, align: 'right' });
      y += Math.max(14, heightOf(line, width - 110));
    }
  }
  if (inv.note) {
    y += 14;
    text(inv.note, left, y, { width, size: 9, color: MUTED, lineBreak: true });
  }
  doc.end();
  return done;
}
