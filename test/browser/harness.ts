/**
 * Shared set-up of the browser tests and the browser benchmark: the renderer
 * built, the BenchApi service on the simulated bench (a fast clock so a
 * sweep takes seconds), browser mode served in-process on 127.0.0.1 at an
 * ephemeral port, and Debian's Chromium driven by playwright-core.
 */
import { existsSync } from 'node:fs';
import { mkdir, mkdtemp, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { chromium, type Browser, type Page } from 'playwright-core';
import { afterEach } from 'vitest';
import { startBrowserServer, type BrowserServer } from '../../main/server/http-server.ts';
import { ensureRendererBuilt, PROJECT_ROOT } from '../../main/server/renderer-build.ts';
import type { BenchService } from '../../main/service/bench-service.ts';
import { createDefaultBenchService } from '../../main/service/default-ports.ts';
import { ScaledClock } from '../../main/time/scaled-clock.ts';

export const CHROMIUM_PATH = '/usr/bin/chromium';
export const hasChromium = existsSync(CHROMIUM_PATH);
export const SKIP_REASON = `browser tests skipped: no Chromium at ${CHROMIUM_PATH} (Debian: apt-get install chromium)`;

/** The selector of a stable test id (what the browser tests drive). */
export const byId = (id: string): string => `[data-testid="${id}"]`;

export const SCREENS_DIR = join(PROJECT_ROOT, 'test-artifacts', 'screens');

export const CHROMIUM_FLAGS = [
  '--headless',
  '--no-sandbox',
  '--disable-gpu',
  '--no-first-run',
  '--disable-background-networking',
  '--disable-component-update',
  '--disable-sync',
];

export async function launchChromium(): Promise<Browser> {
  return chromium.launch({ executablePath: CHROMIUM_PATH, headless: true, args: CHROMIUM_FLAGS });
}

export interface ServedApp {
  server: BrowserServer;
  service: BenchService;
  runsDir: string;
  downloadsDir: string;
  close(): Promise<void>;
}

export interface ServeOptions {
  /** How much faster than real time the simulated bench runs. Default 25. */
  simSpeed?: number;
  /** Use this runs folder (kept on close) instead of a fresh temporary one. */
  runsDir?: string;
}

export async function serveApp(options: ServeOptions = {}): Promise<ServedApp> {
  const rendererDir = await ensureRendererBuilt();
  const scratch = await mkdtemp(join(tmpdir(), 'tunebench-browser-'));
  const runsDir = options.runsDir ?? join(scratch, 'runs');
  const downloadsDir = join(scratch, 'downloads');
  await mkdir(downloadsDir, { recursive: true });
  const speed = options.simSpeed ?? 25;
  const service = createDefaultBenchService({ runsDir, simClock: () => new ScaledClock(speed) });
  const server = await startBrowserServer({ host: '127.0.0.1', port: 0, rendererDir, api: service });
  return {
    server,
    service,
    runsDir,
    downloadsDir,
    close: async () => {
      await service.close();
      await server.close();
      await rm(scratch, { recursive: true, force: true });
    },
  };
}

/** Registers an afterEach that leaves a picture of the page when a test fails: `failed-<prefix>-<test name>.png`. */
export function shotOnFailure(prefix: string, page: () => Page | undefined): void {
  afterEach(async (context) => {
    const shown = page();
    if (!shown || context.task.result?.state !== 'fail') return;
    const name = context.task.name.slice(0, 40).replace(/\W+/g, '-');
    await shown.screenshot({ path: join(SCREENS_DIR, `failed-${prefix}-${name}.png`), fullPage: true });
  });
}
