/**
 * Opening a run while its column cache is still being built in the
 * background (the app's service builds it when a big run finishes) takes the
 * table being built: the CSV is parsed once, not twice (issue 12 item 2).
 * readSampleTable is counted through a module mock; everything else is the
 * store's own code on a real run folder.
 */
import { stat } from 'node:fs/promises';
import { join } from 'node:path';
import { describe, expect, it, vi } from 'vitest';
import { VirtualClock } from '../time/virtual-clock.ts';
import { COLUMN_CACHE_FILE } from './column-cache.ts';
import { cacheFinishedRun } from './cached-samples.ts';
import { openRun } from './run-store.ts';
import { createRun } from './run-writer.ts';
import { withTempDir } from './testing/temp-dir.ts';

const parses = vi.hoisted(() => ({ count: 0 }));

vi.mock('./sample-table.ts', async (importOriginal) => {
  const original = await importOriginal<typeof import('./sample-table.ts')>();
  return {
    ...original,
    readSampleTable: (...args: Parameters<typeof original.readSampleTable>) => {
      parses.count += 1;
      return original.readSampleTable(...args);
    },
  };
});

const ROWS = 60_000;

describe('a run opened while its column cache is being built', () => {
  it('shares the build under way: the CSV is parsed once, and the opening gets every reading', async () => {
    await withTempDir(async (runsDir) => {
      const writer = await createRun({
        runsDir,
        kind: 'drift',
        dut: { id: 'in-flight-osc' },
        instruments: [],
        plan: {},
        columns: ['time_s', 'frequency_hz', 'status'],
        clock: new VirtualClock({ startWallIso: '2026-12-02T08:00:00Z' }),
      });
      for (let i = 0; i < ROWS; i++) writer.appendSample([i * 0.5, 25e6 + (i % 13), i % 97 === 0 ? 'no-signal' : 'ok']);
      await writer.finish('complete');
      const dir = join(runsDir, writer.id);
      parses.count = 0;
      const building = cacheFinishedRun(dir, ROWS);
      // Opened at once, as a page does when the finished run appears in its list.
      const opened = await openRun(runsDir, writer.id);
      expect(await building).toBe(true);
      expect(parses.count).toBe(1);
      expect(opened.samples.rowCount).toBe(ROWS);
      expect(opened.samples.numeric.frequency_hz?.[ROWS - 1]).toBe(25e6 + ((ROWS - 1) % 13));
      await stat(join(dir, COLUMN_CACHE_FILE));
      // Once built, later openings read the cache: still one parse.
      await openRun(runsDir, writer.id);
      expect(parses.count).toBe(1);
    });
  });
});
