/** CSV as RFC 4180 writes it: comma-separated, CRLF line ends, a field quoted when it holds a comma, quote or line break. */

export type Cell = string | number | boolean | null;

function cell(v: Cell): string {
  if (v === null) return '';
  // Shortest round-trip text of a double, so a re-import reads back the very same number.
  const text = typeof v === 'number' ? (Number.isFinite(v) ? String(v) : '') : String(v);
  return /[",\r\n]/.test(text) || text !== text.trim() ? `"${text.replace(/"/g, '""')}"` : text;
}

export function csvText(header: readonly string[], rows: readonly (readonly Cell[])[]): string {
  return [header, ...rows].map((r) => r.map(cell).join(',')).join('\r\n') + '\r\n';
}
