/**
 * The gain table as files: CSV (SI base units, for scripts), Markdown and a
 * standalone HTML page (prefixed units, for people). One prefix per row so
 * min, typ and max read in the same unit.
 */
import type { Datasheet, DatasheetRow } from '../../analysis/datasheet.ts';
import { formatNumber, siPrefixFor } from '../../analysis/format-si.ts';

export interface ShownRow {
  parameter: string;
  conditions: string;
  min: string;
  typ: string;
  max: string;
  unit: string;
}

export function showRow(row: DatasheetRow): ShownRow {
  const reference = row.typ ?? row.max ?? row.min ?? 0;
  const { scale, symbol } = row.scaling === 'si' && row.unit !== '' ? siPrefixFor(reference) : { scale: 1, symbol: '' };
  const show = (value: number | null) => (value === null ? '' : formatNumber(value / scale, 4));
  return { parameter: row.parameter, conditions: row.conditions, min: show(row.min), typ: show(row.typ), max: show(row.max), unit: `${symbol}${row.unit}` };
}

function csvCell(text: string): string {
  return /[",\n\r]/.test(text) ? `"${text.replace(/"/g, '""')}"` : text;
}

export function datasheetCsv(sheet: Datasheet): string {
  const lines = ['parameter,conditions,min,typ,max,unit,runs'];
  const num = (value: number | null) => (value === null ? '' : String(value));
  for (const row of sheet.rows) {
    lines.push([row.parameter, row.conditions, num(row.min), num(row.typ), num(row.max), row.unit, String(row.runs)].map(csvCell).join(','));
  }
  return `${lines.join('\r\n')}\r\n`;
}

function mdCell(text: string): string {
  return text.replace(/\|/g, '\\|').replace(/\n/g, ' ');
}

export function datasheetMarkdown(sheet: Datasheet): string {
  const out = [`# ${mdCell(sheet.title)}`, '', '| Parameter | Conditions | Min | Typ | Max | Unit |', '|---|---|--:|--:|--:|---|'];
  for (const row of sheet.rows.map(showRow)) out.push(`| ${[row.parameter, row.conditions, row.min, row.typ, row.max, row.unit].map(mdCell).join(' | ')} |`);
  out.push('', 'Runs:', ...sheet.runs.map((r) => `- ${mdCell(r.label)} (${r.kind})`), '', 'Notes:', ...sheet.notes.map((n) => `- ${mdCell(n)}`), '');
  return out.join('\n');
}

function esc(text: string): string {
  return text.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;').replace(/"/g, '&quot;');
}

export function datasheetHtml(sheet: Datasheet): string {
  const rows = sheet.rows
    .map(showRow)
    .map((r) => `<tr><th scope="row">${esc(r.parameter)}</th><td>${esc(r.conditions)}</td><td class="n">${esc(r.min)}</td><td class="n">${esc(r.typ)}</td><td class="n">${esc(r.max)}</td><td>${esc(r.unit)}</td></tr>`)
    .join('\n');
  return `<!doctype html>
<html lang="en"><head><meta charset="utf-8"><title>${esc(sheet.title)}</title>
<style>body{font:14px/1.4 system-ui,sans-serif;margin:2em;color:#1d232b}table{border-collapse:collapse}th,td{border-bottom:1px solid #ccc;padding:4px 10px;text-align:left}td.n{text-align:right;font-variant-numeric:tabular-nums}</style>
</head><body>
<h1>${esc(sheet.title)}</h1>
<table>
<thead><tr><th>Parameter</th><th>Conditions</th><th>Min</th><th>Typ</th><th>Max</th><th>Unit</th></tr></thead>
<tbody>
${rows}
</tbody></table>
<h2>Runs</h2><ul>${sheet.runs.map((r) => `<li>${esc(r.label)} (${esc(r.kind)})</li>`).join('')}</ul>
<h2>Notes</h2><ul>${sheet.notes.map((n) => `<li>${esc(n)}</li>`).join('')}</ul>
</body></html>
`;
}
