/**
 * The finish-time cost of a big run's column cache (main/store/cached-samples.ts
 * cacheFinishedRun: the CLI awaits it once the bench is safe, the app builds it
 * in the background): wall time, CPU time and the peak RSS of a fresh process
 * that does only that, on a run folder given on its command line. The
 * big-runs bench runs it as a child (`cacheFinishCost`), so the peak is its own.
 */
import { spawn } from 'node:child_process';
import { once } from 'node:events';
import { rm } from 'node:fs/promises';
import { join } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';
import { COLUMN_CACHE_FILE } from '../../main/store/column-cache.ts';
import { cacheFinishedRun } from '../../main/store/cached-samples.ts';

export interface CacheFinishCost {
  written: boolean;
  wallS: number;
  cpuS: number;
  peakRssMiB: number;
  /** Peak RSS of the same process before the build (Node, tsx and the store loaded). */
  baseRssMiB: number;
}

/** Runs the build in a child process on `dir` (any cache there is removed first). */
export async function cacheFinishCost(dir: string, rows: number): Promise<CacheFinishCost> {
  await rm(join(dir, COLUMN_CACHE_FILE), { force: true });
  const child = spawn(process.execPath, ['--import', 'tsx', fileURLToPath(import.meta.url), dir, String(rows)], {
    stdio: ['ignore', 'pipe', 'inherit'],
  });
  let out = '';
  child.stdout.on('data', (chunk: Buffer) => (out += chunk.toString()));
  await once(child, 'exit');
  return JSON.parse(out) as CacheFinishCost;
}

if (import.meta.url === pathToFileURL(process.argv[1] ?? '').href) {
  const [dir, rows] = process.argv.slice(2);
  const baseRssMiB = process.resourceUsage().maxRSS / 1024;
  const cpu0 = process.cpuUsage();
  const t0 = performance.now();
  const written = await cacheFinishedRun(dir ?? '.', Number(rows));
  const wallS = (performance.now() - t0) / 1000;
  const cpu = process.cpuUsage(cpu0);
  const cost: CacheFinishCost = {
    written,
    wallS,
    cpuS: (cpu.user + cpu.system) / 1e6,
    peakRssMiB: process.resourceUsage().maxRSS / 1024,
    baseRssMiB,
  };
  process.stdout.write(JSON.stringify(cost));
}
