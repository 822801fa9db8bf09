/**
 * Datasheet exports: Markdown, CSV (SI base units, machine-readable) and a
 * standalone printable HTML page (inline style, no external assets).
 */
import type { Datasheet, DatasheetRow } from './datasheet.ts';
import { belowFloor, formatFigure } from './format-figure.ts';
import { formatNumber, siPrefixFor } from './format-si.ts';

/**
 * Cells of a row scaled to one prefix per row ("kHz/V" in the unit column).
 * With an uncertainty, each cell shows the digits it supports and typ carries
 * "± u" (formatFigure); a figure within 2σ of zero reads "not significant (±u)".
 */
export function displayRow(row: DatasheetRow): { min: string; typ: string; max: string; unit: string } {
  const values = [row.min, row.typ, row.max].filter((v): v is number => v !== null);
  const biggest = values.reduce((m, v) => Math.max(m, Math.abs(v)), row.uncertainty ?? 0);
  const { scale, symbol } = row.scaling === 'si' ? siPrefixFor(biggest) : { scale: 1, symbol: '' };
  const digits = row.scaling === 'si' ? 4 : 3;
  // An uncertainty at the numerical floor (exact data) supports no extra digits: shown without ±.
  const u =
    row.uncertainty !== null && row.uncertainty > 0 && !belowFloor(row.uncertainty, biggest, 1e-9)
      ? row.uncertainty / scale
      : null;
  const cell = (v: number | null): string => {
    if (v === null) return '';
    if (u === null) return formatNumber(v / scale, digits);
    // The digits u supports: strip the "± u" part of the shared formatter's output.
    return formatFigure(v / scale, '', { uncertainty: u, plain: true }).split(' ± ')[0] as string;
  };
  const typ =
    row.typ === null
      ? ''
      : u === null
        ? cell(row.typ)
        : formatFigure(row.typ / scale, '', { uncertainty: u, plain: true });
  return {
    min: cell(row.min),
    typ:
      row.significant || row.typ === null
        ? typ
        : `not significant (±${formatFigure(u ?? NaN, '', { digits: 2, plain: true })})`,
    max: cell(row.max),
    unit: row.unit ? `${symbol}${row.unit}` : '',
  };
}

export const SIMULATED_BANNER = 'SIMULATED BENCH: figures from the built-in simulator, not from hardware.';

const HEAD = ['Parameter', 'Conditions', 'Min', 'Typ', 'Max', 'Unit'];

/**
 * Text as Markdown shows it literally: one line, HTML specials as entities
 * (a `<script>` title stays text wherever the Markdown is rendered), and
 * Markdown's own marks (emphasis, code, links, tables) backslash-escaped.
 */
export function mdEscape(text: string): string {
  return text
    .replace(/[\r\n]+/g, ' ')
    .replace(/&/g, '&amp;')
    .replace(/</g, '&lt;')
    .replace(/>/g, '&gt;')
    .replace(/([\\`*_[\]|~])/g, '\\$1');
}

export function renderDatasheetMarkdown(sheet: Datasheet): string {
  const lines = [
    `# ${mdEscape(sheet.title)}`,
    '',
    ...(sheet.simulated ? [`**${SIMULATED_BANNER}**`, ''] : []),
    `Runs: ${mdEscape(sheet.runs.map((r) => `${r.label} (${r.kind}${r.simulated ? ', simulated' : ''})`).join(', '))}`,
    '',
  ];
  lines.push(`| ${HEAD.join(' | ')} |`, '|---|---|--:|--:|--:|---|');
  for (const row of sheet.rows) {
    const d = displayRow(row);
    lines.push(`| ${[row.parameter, row.conditions, d.min, d.typ, d.max, d.unit].map(mdEscape).join(' | ')} |`);
  }
  lines.push('', ...sheet.notes.map((n) => `- ${mdEscape(n)}`), '');
  return lines.join('\n');
}

function csvCell(text: string): string {
  return /[",\n\r]/.test(text) ? `"${text.replace(/"/g, '""')}"` : text;
}

/** CSV in SI base units (full precision), for spreadsheets and scripts. */
export function renderDatasheetCsv(sheet: Datasheet): string {
  const lines = [
    ['key', 'parameter', 'conditions', 'min', 'typ', 'max', 'unit', 'runs', 'uncertainty', 'significant', 'bench'].join(
      ',',
    ),
  ];
  const bench = sheet.simulated ? 'simulated' : 'measured';
  for (const row of sheet.rows) {
    const num = (v: number | null): string => (v === null ? '' : String(v));
    lines.push(
      [
        row.key,
        row.parameter,
        row.conditions,
        num(row.min),
        num(row.typ),
        num(row.max),
        row.unit,
        String(row.runs),
        num(row.uncertainty),
        String(row.significant),
        bench,
      ]
        .map(csvCell)
        .join(','),
    );
  }
  return `${lines.join('\n')}\n`;
}

export function html(text: string): string {
  return text.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;').replace(/"/g, '&quot;');
}

export const STYLE = `
  body { font: 11pt/1.4 system-ui, sans-serif; color: #111; background: #fff; margin: 2em auto; max-width: 60em; padding: 0 1em; }
  h1 { font-size: 16pt; margin: 0 0 0.3em; }
  p.runs { color: #444; margin: 0 0 1em; }
  p.simulated { border: 2px solid #333; padding: 0.4em 0.6em; margin: 0 0 1em; }
  table { border-collapse: collapse; width: 100%; }
  th, td { border-bottom: 1px solid #bbb; padding: 0.3em 0.6em; text-align: left; vertical-align: top; }
  th { border-bottom: 2px solid #333; font-weight: 600; }
  td.num { text-align: right; font-variant-numeric: tabular-nums; white-space: nowrap; }
  tbody tr:nth-child(even) { background: #f4f4f4; }
  ul.notes { color: #444; font-size: 9.5pt; margin-top: 1em; }
  @media print { body { margin: 0; max-width: none; } tbody tr:nth-child(even) { background: none; } tr { break-inside: avoid; } }
`;

/** A table of escaped-or-built cells under plain-text headings. */
export function htmlTable(head: readonly string[], rows: string): string {
  return `<table>
<thead><tr>${head.map((h) => `<th>${h}</th>`).join('')}</tr></thead>
<tbody>
${rows}
</tbody>
</table>`;
}

export interface HtmlPage {
  title: string;
  simulated: boolean;
  /** The line under the title (plain text; escaped here). */
  lead: string;
  /** Tables and headings, already escaped. */
  body: string;
  notes: readonly string[];
  /** CSS added after the shared style. */
  extraStyle?: string;
}

/** One self-contained HTML page (gain table, campaign datasheet); prints on A4/Letter with a light style. */
export function htmlPage(page: HtmlPage): string {
  return `<!doctype html>
<html lang="en">
<head>
<meta charset="utf-8">
<title>${html(page.title)}</title>
<style>${STYLE}${page.extraStyle ?? ''}</style>
</head>
<body>
<h1>${html(page.title)}</h1>
${page.simulated ? `<p class="simulated"><strong>${html(SIMULATED_BANNER)}</strong></p>\n` : ''}<p class="runs">${html(page.lead)}</p>
${page.body}
<ul class="notes">${page.notes.map((n) => `<li>${html(n)}</li>`).join('')}</ul>
</body>
</html>
`;
}

export function renderDatasheetHtml(sheet: Datasheet): string {
  const body = sheet.rows
    .map((row) => {
      const d = displayRow(row);
      return `<tr><td>${html(row.parameter)}</td><td>${html(row.conditions)}</td><td class="num">${html(d.min)}</td><td class="num">${html(d.typ)}</td><td class="num">${html(d.max)}</td><td>${html(d.unit)}</td></tr>`;
    })
    .join('\n');
  return htmlPage({
    title: sheet.title,
    simulated: sheet.simulated,
    lead: `Runs: ${sheet.runs.map((r) => `${r.label} (${r.kind}${r.simulated ? ', simulated' : ''})`).join(', ')}`,
    body: htmlTable(HEAD, body),
    notes: sheet.notes,
  });
}
