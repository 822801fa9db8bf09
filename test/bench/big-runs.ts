/**
 * Big runs open fast (issue 12 item 2), through a real `tunebench serve`
 * child and headless Chromium, for a 1,000,000- and a 10,000,000-reading
 * drift run (16 readings a second: 17 hours and a week), each written by
 * ./drift-run-writer.ts into a temporary folder:
 *  - cold: the first open ever, no column cache yet (main parses samples.csv
 *    and writes samples.columns), in a fresh serve process;
 *  - warm: a later open in another fresh serve process, from the cache.
 * For each: click → first draw (the pixel preview; target ≤ 1 s for 1M and
 * ≤ 3 s for 10M, warm), → drawn from every reading, → analysis on screen;
 * peak RSS of the serve process (VmHWM) and of the page's renderer process
 * (VmHWM, found through CDP SystemInfo.getProcessInfo), and the page's JS
 * heap at the end (CDP Performance.getMetrics); and between the two, the
 * finish-time cost of building the cache (./cache-finish-cost.ts). A log this
 * big stays in main after its preview: the page gets main's windows and
 * analysis (app/contract/run-window.ts), never the readings.
 * `npm run bench -- big-runs`; pass sizes to run a subset (`npx tsx test/bench/big-runs.ts 1e6`).
 */
import { readFile, mkdtemp, rm } from 'node:fs/promises';
import { loadavg, tmpdir } from 'node:os';
import { join } from 'node:path';
import { pathToFileURL } from 'node:url';
import { ensureRendererBuilt } from '../../main/server/renderer-build.ts';
import { CHROMIUM_PATH, hasChromium, launchChromium } from '../browser/harness.ts';
import { startServe } from '../testing/serve-process.ts';
import { cacheFinishCost } from './cache-finish-cost.ts';
import { writeSyntheticDriftRun } from './drift-run-writer.ts';
import { timeRunOpen, type OpenTiming } from './open-timing.ts';

interface OpenFigures extends OpenTiming {
  /** CPU seconds (user + system) from the click until the preview was on screen: free of the machine's load. */
  serveCpuToPreviewS: number;
  rendererCpuToPreviewS: number;
  serveHwmMiB: number;
  rendererHwmMiB: number;
  pageHeapMiB: number;
  load: number;
}

/** Peak resident set of a process (VmHWM), MiB; NaN when it cannot be read. */
async function peakRssMiB(pid: number): Promise<number> {
  const status = await readFile(`/proc/${pid}/status`, 'utf8').catch(() => '');
  const kib = /VmHWM:\s+(\d+) kB/.exec(status)?.[1];
  return kib === undefined ? Number.NaN : Number(kib) / 1024;
}

/** CPU seconds (user + system) a process has used so far; NaN when it cannot be read. */
async function cpuSeconds(pid: number): Promise<number> {
  const stat = await readFile(`/proc/${pid}/stat`, 'utf8').catch(() => '');
  // Fields after the command name (which may hold spaces): utime and stime are the 12th and 13th, in clock ticks.
  const fields = stat.slice(stat.lastIndexOf(')') + 2).split(' ');
  return (Number(fields[11]) + Number(fields[12])) / 100;
}

async function openOnce(runsDir: string, rendererDir: string, id: string): Promise<OpenFigures> {
  const serve = await startServe({ runsDir, rendererDir });
  const browser = await launchChromium();
  try {
    const page = await browser.newPage({ viewport: { width: 1280, height: 860 } });
    await page.goto(serve.url);
    await page.click('[data-testid="nav-runs"]');
    await page.waitForSelector(`[data-testid="run-open-${id}"]`, { timeout: 60_000 });
    const load = loadavg()[0] ?? Number.NaN;
    const cdp = await browser.newBrowserCDPSession();
    const info = (await cdp.send('SystemInfo.getProcessInfo')) as { processInfo: { type: string; id: number }[] };
    const renderers = info.processInfo.filter((p) => p.type === 'renderer');
    const servePid = serve.process.pid as number;
    const rendererCpu = async (): Promise<number> =>
      (await Promise.all(renderers.map((p) => cpuSeconds(p.id)))).reduce((a, b) => a + b, 0);
    const cpu0 = { serve: await cpuSeconds(servePid), renderer: await rendererCpu() };
    const opening = timeRunOpen(page, id, 600_000);
    // The preview on screen: its mark (app/state/runs-store.ts). A log held in main replaces it after one paint,
    // too soon for a selector to be seen, so the mark is polled from here.
    const drawnMarks = "performance.getEntriesByName('tunebench:plot-drawn:drift-plot').length";
    for (let waited = 0; waited < 600_000 && (await page.evaluate<number>(drawnMarks)) === 0; waited += 20)
      await new Promise((resolve) => setTimeout(resolve, 20));
    const serveCpuToPreviewS = (await cpuSeconds(servePid)) - cpu0.serve;
    const rendererCpuToPreviewS = (await rendererCpu()) - cpu0.renderer;
    const timing = await opening;
    const rendererHwmMiB = Math.max(...(await Promise.all(renderers.map((p) => peakRssMiB(p.id)))));
    const pageCdp = await page.context().newCDPSession(page);
    await pageCdp.send('Performance.enable');
    const metrics = await pageCdp.send('Performance.getMetrics');
    const heap = metrics.metrics.find((m) => m.name === 'JSHeapUsedSize')?.value ?? Number.NaN;
    return {
      ...timing,
      serveCpuToPreviewS,
      rendererCpuToPreviewS,
      serveHwmMiB: await peakRssMiB(serve.process.pid as number),
      rendererHwmMiB,
      pageHeapMiB: heap / 2 ** 20,
      load,
    };
  } finally {
    await browser.close();
    serve.process.kill('SIGTERM');
    await serve.exited;
  }
}

const ms = (x: number): string => (Number.isFinite(x) ? `${(x / 1000).toFixed(2)} s` : 'n/a');

function report(label: string, f: OpenFigures, targetMs: number | null): void {
  const verdict =
    targetMs === null ? '' : ` (target ≤ ${targetMs / 1000} s) ${f.firstDrawMs <= targetMs ? 'meets' : 'MISSES'}`;
  console.log(
    `  ${label}: first draw ${ms(f.firstDrawMs)}${f.previewFirst ? ' (pixel preview)' : ''}${verdict} [load ${f.load.toFixed(2)}]; ` +
      `every reading drawn ${ms(f.fullDrawMs)}, analysis shown ${ms(f.analysedMs)}`,
  );
  console.log(
    `    CPU from the click to the preview on screen (free of load): serve ${f.serveCpuToPreviewS.toFixed(2)} s, page renderer ${f.rendererCpuToPreviewS.toFixed(2)} s`,
  );
  console.log(
    `    peak RSS: serve ${f.serveHwmMiB.toFixed(0)} MiB, page renderer ${f.rendererHwmMiB.toFixed(0)} MiB; page JS heap after ${f.pageHeapMiB.toFixed(0)} MiB; ` +
      `page marks: preview ${ms(f.marks['tunebench:open-run:preview'] ?? Number.NaN)}, first window from main ${ms(f.marks['tunebench:open-run:window'] ?? Number.NaN)}, full reply ${ms(f.marks['tunebench:ws:large-message'] ?? Number.NaN)}, columns ${ms(f.marks['tunebench:open-run:columns'] ?? Number.NaN)}`,
  );
}

export async function runBigRunsBench(sizes: number[] = [1_000_000, 10_000_000]): Promise<void> {
  if (!hasChromium) {
    console.log(`big-runs bench skipped: no Chromium at ${CHROMIUM_PATH}`);
    return;
  }
  const rendererDir = await ensureRendererBuilt();
  for (const samples of sizes) {
    const scratch = await mkdtemp(join(tmpdir(), 'tunebench-bench-big-'));
    try {
      const runsDir = join(scratch, 'runs');
      const t0 = performance.now();
      const id = await writeSyntheticDriftRun({ runsDir, samples });
      const csvBytes = (await readFile(join(runsDir, id, 'samples.csv'))).byteLength;
      console.log(
        `${samples.toLocaleString('en')}-reading drift run (${(csvBytes / 2 ** 20).toFixed(0)} MiB of CSV, written in ${((performance.now() - t0) / 1000).toFixed(1)} s):`,
      );
      const target = samples <= 1_000_000 ? 1000 : 3000;
      report('cold (first open: CSV parsed, column cache written)', await openOnce(runsDir, rendererDir, id), null);
      // What the run's finish pays to make the next opening warm (the cold open's cache is removed first).
      const load = loadavg()[0] ?? Number.NaN;
      const cost = await cacheFinishCost(join(runsDir, id), samples);
      console.log(
        `  cacheFinishedRun at finish (a process of its own): ${cost.wallS.toFixed(2)} s wall [load ${load.toFixed(2)}], ` +
          `${cost.cpuS.toFixed(2)} s CPU, peak RSS ${cost.peakRssMiB.toFixed(0)} MiB (${cost.baseRssMiB.toFixed(0)} MiB before it)` +
          `${cost.written ? '' : ' — NO CACHE WRITTEN'}`,
      );
      report('warm (from the column cache)', await openOnce(runsDir, rendererDir, id), target);
    } finally {
      await rm(scratch, { recursive: true, force: true });
    }
  }
}

if (import.meta.url === pathToFileURL(process.argv[1] ?? '').href) {
  const sizes = process.argv.slice(2).map(Number);
  await runBigRunsBench(sizes.length > 0 ? sizes : undefined);
}
