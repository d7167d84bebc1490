// The paint rack as CSV, both ways, through csv-parse and csv-stringify. Pure: text in, rows out.
// Import reports a bad row by the line it starts on and leaves it out; the rest goes on.
import { parse } from 'csv-parse/sync';
import { stringify } from 'csv-stringify/sync';
import { createPaintInput, paintRowFields, finishLabels, paintTypeLabels, paintTypes, finishes, type CreatePaintInput, type Finish, type Paint, type PaintType } from '../../../shared/schemas/paints';
import { dropUnclosedBidi } from '../../../shared/text';
import { csvCell, fromCsvCell } from '../../lib/csv';
import { fieldErrors } from '../../lib/validate';

export const MAX_IMPORT_ROWS = 5000;

type Column = 'name' | 'maker' | 'range' | 'type' | 'finish' | 'hex' | 'stock' | 'lowStockThreshold' | 'notes';

/** Export headers, in order; import also takes the aliases (any case, spaces or underscores). */
const columns: { key: Column; header: string; aliases: string[] }[] = [
  { key: 'name', header: 'Name', aliases: ['paint', 'paint name'] },
  { key: 'maker', header: 'Maker', aliases: ['brand', 'manufacturer'] },
  { key: 'range', header: 'Range', aliases: ['line', 'series'] },
  { key: 'type', header: 'Type', aliases: ['kind'] },
  { key: 'finish', header: 'Finish', aliases: ['sheen'] },
  { key: 'hex', header: 'Colour', aliases: ['color', 'hex', 'colour hex', 'color hex'] },
  { key: 'stock', header: 'Pots in stock', aliases: ['stock', 'pots', 'in stock'] },
  { key: 'lowStockThreshold', header: 'Low below', aliases: ['low stock', 'low stock threshold', 'threshold', 'low at'] },
  { key: 'notes', header: 'Notes', aliases: ['note', 'comments'] },
];

const norm = (s: string) => s.trim().toLowerCase().replace(/[\s_-]+/g, ' ');
const headerIndex = new Map<string, Column>();
for (const c of columns) for (const name of [c.header, c.key, ...c.aliases]) headerIndex.set(norm(name), c.key);

const typeIndex = new Map<string, PaintType>();
for (const t of paintTypes) {
  typeIndex.set(norm(t), t);
  typeIndex.set(norm(paintTypeLabels[t]), t);
}
for (const [alias, t] of Object.entries({ shade: 'wash', 'shade wash': 'wash', 'shade/wash': 'wash', 'enamel wash': 'solvent-wash', 'oil wash': 'solvent-wash', contrast: 'tint', 'one coat': 'tint' } as const)) {
  typeIndex.set(norm(alias), t);
}
const finishIndex = new Map<string, Finish>([...finishes.map((f) => [f, f] as const), ['matt', 'matte'], ['flat', 'matte']]);

const columnLabel = (key: string) => columns.find((c) => c.key === key)?.header ?? key;

export type ParsedRow = { line: number; input: CreatePaintInput };
/** `columns` are the fields the file has: an update changes only those. */
export type ParseResult = { rows: ParsedRow[]; skipped: { line: number; message: string }[]; notes: string[]; columns: (keyof CreatePaintInput)[] };

type Parsed = { record: string[]; info: { lines: number }; raw: string };

/** Reads a rack CSV: a header row naming the columns (any order), then one paint per row. */
export function parsePaintsCsv(text: string): ParseResult {
  const skipped: ParseResult['skipped'] = [];
  const notes: string[] = [];
  let unclosed = false;
  const records = parse(text, {
    bom: true,
    info: true,
    raw: true,
    relax_column_count: true,
    // A stray quote inside a value (12" brush) is kept as it is rather than losing the row.
    relax_quotes: true,
    skip_empty_lines: true,
    skip_records_with_error: true,
    on_skip: (err) => {
      if (err?.code === 'CSV_QUOTE_NOT_CLOSED') unclosed = true;
    },
  }) as unknown as Parsed[];

  // A record ends on info.lines; it starts as many lines earlier as it holds line breaks (quoted
  // newlines). Its raw text also carries the blank lines skipped before it and its own line end.
  const startLine = (r: Parsed) => r.info.lines - (r.raw.replace(/^(\r\n|\n|\r)+/, '').replace(/(\r\n|\n|\r)$/, '').match(/\r\n|\n|\r/g)?.length ?? 0);
  const withLines = records.map((r) => ({ ...r, line: startLine(r) }));

  if (unclosed) {
    const lastEnd = records.length ? records[records.length - 1].info.lines : 0;
    const line = firstNonEmptyLineAfter(text, lastEnd);
    skipped.push({ line, message: `A double quote opened on line ${line} is never closed, so the rest of the file could not be read. Close the quote and import again.` });
  }

  const header = withLines.shift();
  if (!header || header.record.every((h) => !h.trim())) {
    notes.push('The file has no header row. The first row must name the columns, e.g. Name, Maker, Type, Colour.');
    return { rows: [], skipped, notes, columns: [] };
  }
  const mapping: (Column | null)[] = header.record.map((h) => headerIndex.get(norm(h)) ?? null);
  const unknown = header.record.filter((h, i) => h.trim() && mapping[i] === null);
  if (unknown.length) notes.push(`Left out columns we do not know: ${unknown.map((u) => `"${u.trim()}"`).join(', ')}.`);
  const seen = new Set<Column>();
  mapping.forEach((c, i) => {
    if (c && seen.has(c)) {
      notes.push(`The column "${header.record[i].trim()}" appears twice; the first one is used.`);
      mapping[i] = null;
    }
    if (c) seen.add(c);
  });
  if (!seen.has('name')) {
    notes.push('The header row has no Name column, so no paint could be read.');
    return { rows: [], skipped, notes, columns: [] };
  }

  const rows: ParsedRow[] = [];
  for (const r of withLines) {
    if (rows.length + skipped.length >= MAX_IMPORT_ROWS) {
      notes.push(`Only the first ${MAX_IMPORT_ROWS} rows were read; split the file and import the rest.`);
      break;
    }
    // Rows of nothing but separators (",,,,") are what spreadsheets leave below the data.
    if (r.record.every((v) => !v.trim())) continue;
    if (r.record.length !== header.record.length) {
      skipped.push({
        line: r.line,
        message: `This row has ${r.record.length} values where the header has ${header.record.length}. A value with a comma in it needs double quotes around it.`,
      });
      continue;
    }
    const values: Partial<Record<Column, string>> = {};
    r.record.forEach((v, i) => {
      const c = mapping[i];
      if (c) values[c] = dropUnclosedBidi(fromCsvCell(v.trim()));
    });
    const problem = checkWords(values);
    if (problem) {
      skipped.push({ line: r.line, message: problem });
      continue;
    }
    const candidate = {
      name: values.name ?? '',
      maker: values.maker || null,
      range: values.range || null,
      type: values.type ? typeIndex.get(norm(values.type)) : undefined,
      finish: values.finish ? finishIndex.get(norm(values.finish)) : null,
      hex: seen.has('hex') ? values.hex || null : undefined,
      stock: values.stock ? Number(values.stock) : 0,
      lowStockThreshold: values.lowStockThreshold ? Number(values.lowStockThreshold) : null,
      notes: values.notes || null,
    };
    // Without a Colour column the colour rule waits: the import checks it for paints new to the rack.
    const parsed = (seen.has('hex') ? createPaintInput : paintRowFields).safeParse(candidate);
    if (!parsed.success) {
      const fields = fieldErrors(parsed.error.issues);
      skipped.push({ line: r.line, message: Object.entries(fields).map(([k, m]) => `${columnLabel(k)}: ${m}`).join(' ') });
      continue;
    }
    rows.push({ line: r.line, input: parsed.data as CreatePaintInput });
  }
  skipped.sort((a, b) => a.line - b.line);
  return { rows, skipped, notes, columns: [...seen] };
}

/** Words that must be one of a list, and numbers; said in the column's own name. */
function checkWords(v: Partial<Record<Column, string>>): string | null {
  if (!v.type) return `Type: give one of ${paintTypes.map((t) => paintTypeLabels[t]).join(', ')}.`;
  if (!typeIndex.has(norm(v.type))) return `Type: "${v.type}" is not one we know; use one of ${paintTypes.map((t) => paintTypeLabels[t]).join(', ')}.`;
  if (v.finish && !finishIndex.has(norm(v.finish))) return `Finish: "${v.finish}" is not one we know; use Matte, Satin or Gloss, or leave it empty.`;
  for (const k of ['stock', 'lowStockThreshold'] as const) {
    const s = v[k];
    if (s && !/^\d+$/.test(s)) return `${columnLabel(k)}: "${s}" is not a whole number.`;
  }
  return null;
}

function firstNonEmptyLineAfter(text: string, line: number): number {
  const lines = text.replace(/^\uFEFF/, '').split(/\r\n|\n|\r/);
  let i = line; // 0-based index of the line after `line`
  while (i < lines.length && lines[i].trim() === '') i++;
  return Math.min(i + 1, Math.max(1, lines.length));
}

/**
 * The rack as CSV with a byte-order mark (so spreadsheet programs read it as UTF-8) and CRLF line ends.
 * A cell a spreadsheet would run as a formula gets an apostrophe (server/lib/csv); the import takes it off.
 */
export function paintsToCsv(paints: Pick<Paint, 'name' | 'maker' | 'range' | 'type' | 'finish' | 'hex' | 'stock' | 'lowStockThreshold' | 'notes'>[]): string {
  const rows = paints.map((p) => [
    p.name,
    p.maker ?? '',
    p.range ?? '',
    paintTypeLabels[p.type],
    p.finish ? finishLabels[p.finish] : '',
    p.hex ?? '',
    String(p.stock),
    p.lowStockThreshold === null ? '' : String(p.lowStockThreshold),
    p.notes ?? '',
  ].map(csvCell));
  return stringify(rows, { bom: true, header: true, columns: columns.map((c) => c.header), record_delimiter: 'windows' });
}
