// The quote editor's state: what the owner types, kept as text so a bad amount can be shown beside its
// box, and turned into the engine's input for the live preview and the save.
import { fromMinor, toMinor } from '../../../../shared/money';
import type { ExtraLineKind, QuoteExtraLine, QuoteFigure } from '../../../../shared/schemas/price-table';
import type { QuoteInput } from '../../../../shared/schemas/quotes';

export type FigureDraft = { figure: QuoteFigure; hours: Record<string, string>; omit: string[] };
export type LineDraft = { id: string | number | null; kind: ExtraLineKind; label: string; quantity: string; unitAmount: string; taxable: boolean };
export type EditorDraft = { figures: FigureDraft[]; lines: LineDraft[]; dueDate: string };
export type DraftErrors = Record<string, string>;

const hoursText = (h: number) => String(Math.round(h * 10_000) / 10_000);

function money(minor: number, currency: string): string {
  try {
    return fromMinor(minor, currency);
  } catch {
    return String(minor);
  }
}

export function draftFrom(input: QuoteInput, currency: string): EditorDraft {
  return {
    figures: input.figures.map((f) => ({
      figure: f,
      hours: Object.fromEntries(Object.entries(f.stageHours ?? {}).map(([k, h]) => [k, hoursText(h)])),
      omit: [...(f.omitStages ?? [])],
    })),
    lines: input.extraLines.map((l) => ({
      id: l.id ?? null,
      kind: l.kind,
      label: l.label,
      quantity: String(l.quantity ?? 1),
      unitAmount: money(l.unitAmount, currency),
      taxable: l.taxable ?? true,
    })),
    dueDate: input.dueDate ?? '',
  };
}

export function lineFromPreset(p: { kind: ExtraLineKind; label: string; amount: number; taxable: boolean }, currency: string): LineDraft {
  return { id: null, kind: p.kind, label: p.label, quantity: '1', unitAmount: money(p.amount, currency), taxable: p.taxable };
}

/** The draft as the engine's input, and the boxes that cannot be read (by path). */
export function inputFrom(d: EditorDraft, currency: string): { input: QuoteInput; errors: DraftErrors } {
  const errors: DraftErrors = {};
  const figures: QuoteFigure[] = d.figures.map((fd, i) => {
    const stageHours: Record<string, number> = {};
    for (const [stage, text] of Object.entries(fd.hours)) {
      const s = text.trim();
      if (s === '') continue;
      if (/^\d+,\d+$/.test(s)) errors[`figures.${i}.stageHours.${stage}`] = `Use a point: ${s.replace(',', '.')}`;
      else if (!/^\d+(\.\d+)?$/.test(s) || Number(s) > 1000) errors[`figures.${i}.stageHours.${stage}`] = 'Hours as a number, such as 1.5.';
      else stageHours[stage] = Number(s);
    }
    return { ...fd.figure, stageHours, omitStages: fd.omit };
  });
  const extraLines: QuoteExtraLine[] = d.lines.map((l, i) => {
    const p = `extraLines.${i}`;
    if (!l.label.trim()) errors[`${p}.label`] = 'Name the line.';
    let quantity = 1;
    if (!/^\d+$/.test(l.quantity.trim()) || Number(l.quantity) < 1 || Number(l.quantity) > 10_000) errors[`${p}.quantity`] = 'Use a whole number from 1.';
    else quantity = Number(l.quantity);
    let unitAmount = 0;
    try {
      unitAmount = toMinor(l.unitAmount, currency);
      if (unitAmount < 0) errors[`${p}.unitAmount`] = 'Amounts cannot be negative.';
    } catch (err) {
      errors[`${p}.unitAmount`] = err instanceof Error ? err.message : 'That is not an amount.';
    }
    return { id: l.id, kind: l.kind, label: l.label.trim(), quantity, unitAmount, taxable: l.taxable };
  });
  return { input: { figures, extraLines, dueDate: d.dueDate || null }, errors };
}

/** Same content, same text: to tell whether the screen holds changes that are not saved. */
export function sameInput(a: QuoteInput, b: QuoteInput): boolean {
  const norm = (q: QuoteInput) =>
    JSON.stringify({
      f: q.figures.map((f) => [f.id, Object.entries(f.stageHours ?? {}).sort(), [...(f.omitStages ?? [])].sort()]),
      l: q.extraLines.map((l) => [l.kind, l.label, l.quantity ?? 1, l.unitAmount, l.taxable ?? true]),
      d: q.dueDate ?? null,
    });
  return norm(a) === norm(b);
}
