/**
 * A chart as files: PNG (the drawn canvas under its title), SVG (the same
 * chart redrawn as vectors from uPlot's scales, ticks and data, so it scales
 * for a report), and CSV of the data the chart holds. Text is escaped for XML
 * and quoted for CSV.
 */

/** A series label as text (uPlot also allows an element there; exports show only text). */
function labelText(label: unknown): string {
  return typeof label === 'string' || typeof label === 'number' ? String(label) : '';
}
import type uPlot from 'uplot';
import { columnsCsv, csvCell } from '../analysis/csv-cells.ts';

export { columnsCsv, csvCell };

/** uPlot keeps each axis' last tick positions and labels on the axis object. */
interface DrawnAxis {
  _splits?: number[] | null;
  _values?: (string | number | null)[] | null;
  scale?: string;
  side?: number;
  label?: string;
  show?: boolean;
}

export function xmlText(text: string): string {
  return text.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;').replace(/"/g, '&quot;');
}

/** CSV of what the chart holds: every shown series by its legend label. */
export function chartCsv(u: uPlot): string {
  const shown = u.series.map((s, i) => ({ s, i })).filter(({ s, i }) => i === 0 || s.show !== false);
  return columnsCsv(
    shown.map(({ s }) => labelText(s.label)),
    shown.map(({ i }) => u.data[i] as ArrayLike<number | null>),
  );
}

const fmt = (v: number): string => (Math.round(v * 10) / 10).toString();

/** The chart as SVG: frame, grid, tick labels, axis titles, bands, lines and points. */
export function chartSvg(u: uPlot, title: string, colors: { text: string; grid: string; background: string }): string {
  const pr = devicePixelRatioOf(u);
  const left = u.bbox.left / pr;
  const top = u.bbox.top / pr;
  const width = u.bbox.width / pr;
  const height = u.bbox.height / pr;
  const titleH = 24;
  const W = u.width;
  const H = u.height + titleH;
  const parts: string[] = [];
  parts.push(
    `<svg xmlns="http://www.w3.org/2000/svg" width="${W}" height="${H}" viewBox="0 0 ${W} ${H}" font-family="sans-serif" font-size="11">`,
  );
  parts.push(`<rect width="${W}" height="${H}" fill="${xmlText(colors.background)}"/>`);
  parts.push(
    `<text x="8" y="16" font-size="13" font-weight="600" fill="${xmlText(colors.text)}">${xmlText(title)}</text>`,
  );
  parts.push(`<g transform="translate(0 ${titleH})">`);
  parts.push(
    `<rect x="${fmt(left)}" y="${fmt(top)}" width="${fmt(width)}" height="${fmt(height)}" fill="none" stroke="${xmlText(colors.grid)}"/>`,
  );
  const axes = u.axes as unknown as DrawnAxis[];
  axes.forEach((axis, index) => {
    if (axis.show === false) return;
    const scale = axis.scale ?? (index === 0 ? 'x' : 'y');
    const side = axis.side ?? (index === 0 ? 2 : 3);
    const splits = axis._splits ?? [];
    const values = axis._values ?? [];
    const horizontal = side === 0 || side === 2;
    splits.forEach((split, k) => {
      const pos = u.valToPos(split, scale);
      if (!Number.isFinite(pos)) return;
      const label = values[k];
      if (horizontal) {
        const x = left + pos;
        parts.push(
          `<line x1="${fmt(x)}" y1="${fmt(top)}" x2="${fmt(x)}" y2="${fmt(top + height)}" stroke="${xmlText(colors.grid)}"/>`,
        );
        if (label !== null && label !== undefined)
          parts.push(
            `<text x="${fmt(x)}" y="${fmt(top + height + 14)}" text-anchor="middle" fill="${xmlText(colors.text)}">${xmlText(String(label))}</text>`,
          );
      } else {
        const y = top + pos;
        const right = side === 1;
        if (!right)
          parts.push(
            `<line x1="${fmt(left)}" y1="${fmt(y)}" x2="${fmt(left + width)}" y2="${fmt(y)}" stroke="${xmlText(colors.grid)}"/>`,
          );
        if (label !== null && label !== undefined) {
          parts.push(
            `<text x="${fmt(right ? left + width + 6 : left - 6)}" y="${fmt(y + 4)}" text-anchor="${right ? 'start' : 'end'}" fill="${xmlText(colors.text)}">${xmlText(String(label))}</text>`,
          );
        }
      }
    });
    if (axis.label) {
      if (horizontal)
        parts.push(
          `<text x="${fmt(left + width / 2)}" y="${fmt(top + height + 32)}" text-anchor="middle" font-weight="600" fill="${xmlText(colors.text)}">${xmlText(axis.label)}</text>`,
        );
      else {
        const x = side === 1 ? W - 8 : 12;
        parts.push(
          `<text transform="translate(${fmt(x)} ${fmt(top + height / 2)}) rotate(${side === 1 ? 90 : -90})" text-anchor="middle" font-weight="600" fill="${xmlText(colors.text)}">${xmlText(axis.label)}</text>`,
        );
      }
    }
  });
  parts.push(
    `<clipPath id="plot-area"><rect x="${fmt(left)}" y="${fmt(top)}" width="${fmt(width)}" height="${fmt(height)}"/></clipPath>`,
  );
  parts.push('<g clip-path="url(#plot-area)">');
  const xs = u.data[0] as ArrayLike<number>;
  const pointAt = (seriesIndex: number, i: number): [number, number] | null => {
    const s = u.series[seriesIndex];
    const y = (u.data[seriesIndex] as ArrayLike<number | null>)[i];
    const x = xs[i];
    if (!s || y === null || y === undefined || x === undefined || !Number.isFinite(y)) return null;
    return [left + u.valToPos(x, 'x'), top + u.valToPos(y, s.scale ?? 'y')];
  };
  for (const band of (u as unknown as { bands?: uPlot.Band[] }).bands ?? []) {
    const [hiIndex, loIndex] = band.series;
    const upper: string[] = [];
    const lower: string[] = [];
    for (let i = 0; i < xs.length; i += 1) {
      const hi = pointAt(hiIndex, i);
      const lo = pointAt(loIndex, i);
      if (hi && lo) {
        upper.push(`${fmt(hi[0])},${fmt(hi[1])}`);
        lower.unshift(`${fmt(lo[0])},${fmt(lo[1])}`);
      }
    }
    const fill = typeof band.fill === 'string' ? band.fill : 'rgba(128,128,128,0.25)';
    if (upper.length > 1) parts.push(`<polygon points="${[...upper, ...lower].join(' ')}" fill="${xmlText(fill)}"/>`);
  }
  u.series.forEach((s, index) => {
    if (index === 0 || s.show === false) return;
    const stroke = typeof s.stroke === 'function' ? s.stroke(u, index) : s.stroke;
    const color = typeof stroke === 'string' ? stroke : colors.text;
    const drawsLine = s.paths === undefined || s.paths(u, index, 0, 0) !== null;
    const points = s.points as { show?: unknown; size?: number } | undefined;
    const drawsPoints =
      points?.show === true ||
      (typeof points?.show === 'function' && (points.show as (u: uPlot, i: number) => boolean)(u, index));
    if (drawsLine && (s.width ?? 1) > 0 && !(s.stroke === 'transparent')) {
      let run: string[] = [];
      const flush = () => {
        if (run.length > 1)
          parts.push(
            `<polyline points="${run.join(' ')}" fill="none" stroke="${xmlText(color)}" stroke-width="${s.width ?? 1}"/>`,
          );
        run = [];
      };
      for (let i = 0; i < xs.length; i += 1) {
        const p = pointAt(index, i);
        if (p) run.push(`${fmt(p[0])},${fmt(p[1])}`);
        else flush();
      }
      flush();
    }
    if (drawsPoints) {
      const r = (points?.size ?? 5) / 2;
      for (let i = 0; i < xs.length; i += 1) {
        const p = pointAt(index, i);
        if (p) parts.push(`<circle cx="${fmt(p[0])}" cy="${fmt(p[1])}" r="${r}" fill="${xmlText(color)}"/>`);
      }
    }
  });
  parts.push('</g>');
  // Legend: one swatch per shown series.
  let lx = left;
  u.series.forEach((s, index) => {
    if (index === 0 || s.show === false || !s.label) return;
    const stroke = typeof s.stroke === 'function' ? s.stroke(u, index) : s.stroke;
    parts.push(
      `<rect x="${fmt(lx)}" y="${fmt(top + height + 40)}" width="10" height="10" fill="${xmlText(typeof stroke === 'string' ? stroke : colors.text)}"/>`,
    );
    parts.push(
      `<text x="${fmt(lx + 14)}" y="${fmt(top + height + 49)}" fill="${xmlText(colors.text)}">${xmlText(labelText(s.label))}</text>`,
    );
    lx += 24 + labelText(s.label).length * 6.5;
  });
  parts.push('</g></svg>');
  return parts.join('\n');
}

function devicePixelRatioOf(u: uPlot): number {
  const canvas = u.ctx.canvas;
  return canvas.width > 0 && u.width > 0 ? canvas.width / u.width : 1;
}

/** The chart's canvas under its title, on the theme's background, as a PNG blob. */
export function chartPng(u: uPlot, title: string, colors: { text: string; background: string }): Promise<Blob> {
  const source = u.ctx.canvas;
  const pr = devicePixelRatioOf(u);
  const titleH = Math.round(24 * pr);
  const canvas = document.createElement('canvas');
  canvas.width = source.width;
  canvas.height = source.height + titleH;
  const ctx = canvas.getContext('2d');
  if (!ctx) return Promise.reject(new Error('no 2D canvas to draw the PNG on'));
  ctx.fillStyle = colors.background;
  ctx.fillRect(0, 0, canvas.width, canvas.height);
  ctx.fillStyle = colors.text;
  ctx.font = `600 ${Math.round(13 * pr)}px sans-serif`;
  ctx.fillText(title, 8 * pr, 16 * pr);
  ctx.drawImage(source, 0, titleH);
  return new Promise((resolve, reject) =>
    canvas.toBlob((blob) => (blob ? resolve(blob) : reject(new Error('the PNG could not be encoded'))), 'image/png'),
  );
}
