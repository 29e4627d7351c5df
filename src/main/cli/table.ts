/** Aligned plain-text tables for people reading a terminal. */

export type Align = 'left' | 'right';

/**
 * Lines of a table: a header, a rule, then the rows; columns separated by two spaces,
 * text left-aligned and numbers as the caller says. Trailing blanks are trimmed.
 */
export function renderTable(header: readonly string[], rows: readonly (readonly string[])[], align: readonly Align[] = [], indent = '  '): string[] {
  const all = [header, ...rows];
  const widths = header.map((_, c) => Math.max(...all.map((r) => width(r[c] ?? ''))));
  const line = (r: readonly string[]): string =>
    indent +
    r
      .map((cell, c) => (align[c] === 'right' ? padStart(cell, widths[c]) : padEnd(cell, widths[c])))
      .join('  ')
      .trimEnd();
  return [line(header), indent + widths.map((w) => '-'.repeat(w)).join('  '), ...rows.map(line)];
}

/** Display width: code points, so that θ, τ and ± count as one column each. */
function width(text: string): number {
  return [...text].length;
}

function padEnd(text: string, w: number): string {
  return text + ' '.repeat(Math.max(0, w - width(text)));
}

function padStart(text: string, w: number): string {
  return ' '.repeat(Math.max(0, w - width(text))) + text;
}
