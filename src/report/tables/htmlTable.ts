/** One table cell: HTML content (already escaped) and an optional class, e.g. `num` for figures. */
export interface TableCell {
  readonly html: string;
  readonly className?: string;
  readonly columns?: number;
}

export interface HtmlTableOptions {
  readonly id?: string;
  readonly className?: string;
  readonly caption?: string;
  /** Header cells (HTML); several rows allowed. */
  readonly head: readonly (readonly (string | TableCell)[])[];
  readonly rows: readonly (readonly (string | TableCell)[])[];
}

const cellHtml = (tag: 'th' | 'td', cell: string | TableCell): string => {
  if (typeof cell === 'string') return `<${tag}>${cell}</${tag}>`;
  const cls = cell.className === undefined ? '' : ` class="${cell.className}"`;
  const span = cell.columns === undefined ? '' : ` colspan="${cell.columns}"`;
  return `<${tag}${cls}${span}>${cell.html}</${tag}>`;
};

/** An HTML table from already escaped cell contents. */
export function htmlTable(options: HtmlTableOptions): string {
  const id = options.id === undefined ? '' : ` id="${options.id}"`;
  const cls = options.className === undefined ? '' : ` class="${options.className}"`;
  const caption = options.caption === undefined ? '' : `<caption>${options.caption}</caption>`;
  const head = options.head.map((row) => `<tr>${row.map((c) => cellHtml('th', c)).join('')}</tr>`).join('');
  const body = options.rows.map((row) => `<tr>${row.map((c) => cellHtml('td', c)).join('')}</tr>`).join('\n');
  return `<table${id}${cls}>${caption}<thead>${head}</thead><tbody>\n${body}\n</tbody></table>`;
}

/** A numeric cell (right-aligned, tabular figures). */
export const numberCell = (html: string): TableCell => ({ html, className: 'num' });
