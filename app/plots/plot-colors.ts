/**
 * Canvas colours come from the theme's CSS custom properties, so the plots
 * follow the dark/light choice without a second palette in code.
 */
export interface PlotColors {
  text: string;
  grid: string;
  series: [string, string, string, string];
  fit: string;
  stall: string;
  unstable: string;
}

const FALLBACK: PlotColors = {
  text: '#888',
  grid: 'rgba(128,128,128,0.25)',
  series: ['#2a9d8f', '#e76f51', '#8ab17d', '#b388eb'],
  fit: '#e9c46a',
  stall: 'rgba(200,80,80,0.18)',
  unstable: 'rgba(230,160,40,0.22)',
};

export function readPlotColors(
  root: Element | null = typeof document === 'undefined' ? null : document.documentElement,
): PlotColors {
  if (!root) return FALLBACK;
  const style = getComputedStyle(root);
  const read = (name: string, fallback: string) => style.getPropertyValue(name).trim() || fallback;
  return {
    text: read('--plot-text', FALLBACK.text),
    grid: read('--plot-grid', FALLBACK.grid),
    series: [
      read('--plot-s1', FALLBACK.series[0]),
      read('--plot-s2', FALLBACK.series[1]),
      read('--plot-s3', FALLBACK.series[2]),
      read('--plot-s4', FALLBACK.series[3]),
    ],
    fit: read('--plot-fit', FALLBACK.fit),
    stall: read('--plot-stall', FALLBACK.stall),
    unstable: read('--plot-unstable', FALLBACK.unstable),
  };
}
