const map: Record<string, string> = { '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' };

/** Escapes text for HTML bodies and attribute values (mails, /dev/mail, PDFs never take raw HTML). */
export const escapeHtml = (s: unknown) => String(s ?? '').replace(/[&<>"']/g, (c) => map[c]);

/** Tagged template that escapes every interpolated value unless it is wrapped with raw(). */
export class Raw {
  constructor(public value: string) {}
}
export const raw = (s: string) => new Raw(s);
export function html(strings: TemplateStringsArray, ...values: unknown[]): Raw {
  let out = strings[0];
  values.forEach((v, i) => {
    const piece = Array.isArray(v)
      ? v.map((x) => (x instanceof Raw ? x.value : escapeHtml(x))).join('')
      : v instanceof Raw
        ? v.value
        : escapeHtml(v);
    out += piece + strings[i + 1];
  });
  return new Raw(out);
}
