/**
 * Shaded x-ranges (the stall region, the unstable region) drawn as DOM boxes
 * in uPlot's overlay, so they carry test ids and a title, and stay crisp.
 * Positions are set through the CSSOM (element.style), which a strict CSP
 * allows; no style attributes are written into markup.
 */
import type uPlot from 'uplot';

export interface XRegion {
  key: string;
  /** -Infinity / Infinity run to the plot's edge. */
  fromX: number;
  toX: number;
  className: string;
  title: string;
  testId: string;
}

export function regionsPlugin(getRegions: () => readonly XRegion[]): uPlot.Plugin {
  const boxes = new Map<string, HTMLDivElement>();
  function place(u: uPlot): void {
    const regions = getRegions();
    const seen = new Set<string>();
    const xMin = u.scales.x?.min ?? 0;
    const xMax = u.scales.x?.max ?? 1;
    for (const region of regions) {
      const from = Math.max(region.fromX, xMin);
      const to = Math.min(region.toX, xMax);
      if (!(to > from)) continue;
      seen.add(region.key);
      let box = boxes.get(region.key);
      if (!box) {
        box = document.createElement('div');
        box.dataset.testid = region.testId;
        box.setAttribute('role', 'img');
        u.over.appendChild(box);
        boxes.set(region.key, box);
      }
      box.className = `plot-region ${region.className}`;
      box.title = region.title;
      box.setAttribute('aria-label', region.title);
      const left = u.valToPos(from, 'x');
      const right = u.valToPos(to, 'x');
      box.style.left = `${left}px`;
      box.style.width = `${Math.max(1, right - left)}px`;
    }
    for (const [key, box] of boxes) {
      if (!seen.has(key)) {
        box.remove();
        boxes.delete(key);
      }
    }
  }
  return { hooks: { draw: place } };
}
