import { appendFile, readFile, stat, utimes, writeFile } from 'node:fs/promises';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { VirtualClock } from '../time/virtual-clock.ts';
import { COLUMN_CACHE_FILE, decodeColumnCache, encodeColumnCache } from './column-cache.ts';
import { CACHE_AT_FINISH_MIN_ROWS, cacheFinishedRun, openSamples } from './cached-samples.ts';
import { readRunFolder } from './run-reader.ts';
import { openRun } from './run-store.ts';
import { createRun } from './run-writer.ts';
import { readSampleTable } from './sample-table.ts';
import { withTempDir } from './testing/temp-dir.ts';

const CSV = [
  'time_s,control_v,frequency_hz,direction,status',
  '0,1,,up,no-signal',
  '0.1,1.5,2500000,up,ok',
  '0.2,2,3000000.5,down,ok',
  '0.3,2,bad,down,ok', // dropped: bad number
  '0.4,2.5,3500000,down,ok',
  '',
].join('\n');

const KEY = { csvSize: 123, csvMtimeMs: 1_700_000_000_123.25 };

async function finishedRun(runsDir: string, rows: number, status: 'complete' | null = 'complete') {
  const writer = await createRun({
    runsDir,
    kind: 'drift',
    dut: { id: 'cache-test-osc' },
    instruments: [],
    plan: {},
    columns: ['time_s', 'frequency_hz', 'status'],
    clock: new VirtualClock({ startWallIso: '2026-12-01T08:00:00Z' }),
  });
  for (let i = 0; i < rows; i++) writer.appendSample([i, 10e6 + (i % 7), i % 11 === 0 ? 'no-signal' : 'ok']);
  if (status) await writer.finish(status);
  else await writer.flush();
  return { id: writer.id, dir: join(runsDir, writer.id) };
}

describe('binary column cache', () => {
  it('gives back exactly the table parsed from the CSV: names, values, NaN, text codes and dropped lines', () => {
    const table = readSampleTable(CSV);
    const decoded = decodeColumnCache(encodeColumnCache(table, KEY), KEY);
    expect(decoded).toEqual(table);
    expect(Number.isNaN(decoded?.numeric.frequency_hz?.[0])).toBe(true);
    expect(decoded?.dropped).toHaveLength(1);
  });

  it('is ignored when the CSV has another size or time, or the cache is torn, foreign or inconsistent', () => {
    const bytes = encodeColumnCache(readSampleTable(CSV), KEY);
    expect(decodeColumnCache(bytes, { ...KEY, csvSize: 124 })).toBeNull();
    expect(decodeColumnCache(bytes, { ...KEY, csvMtimeMs: KEY.csvMtimeMs + 1 })).toBeNull();
    for (const cut of [0, 7, 12, 40, bytes.length - 1])
      expect(decodeColumnCache(bytes.subarray(0, cut), KEY)).toBeNull();
    expect(decodeColumnCache(Buffer.concat([bytes, Buffer.alloc(8)]), KEY)).toBeNull();
    const foreign = Buffer.from(bytes);
    foreign.write('XXCOLS1\n', 0, 'latin1');
    expect(decodeColumnCache(foreign, KEY)).toBeNull();
    const badHeader = Buffer.from(bytes);
    badHeader[14] = 0x7b; // a brace where the JSON has a key: no longer JSON
    expect(decodeColumnCache(badHeader, KEY)).toBeNull();
    // A text code past its levels.
    const table = readSampleTable(CSV);
    (table.text.status as { codes: Uint8Array }).codes[0] = 9;
    expect(decodeColumnCache(encodeColumnCache(table, KEY), KEY)).toBeNull();
  });

  it('is written on the first open of a finished run, used on the next, and rebuilt when the CSV changes', async () => {
    await withTempDir(async (runsDir) => {
      const { id, dir } = await finishedRun(runsDir, 500);
      const csvPath = join(dir, 'samples.csv');
      const first = await openSamples(csvPath, {}, (without) => readRunFolder(dir, { withoutSamples: without }));
      expect(first.source).toBe('csv');
      const second = await openSamples(csvPath, {}, (without) => readRunFolder(dir, { withoutSamples: without }));
      expect(second.source).toBe('cache');
      expect(second.table).toEqual(first.table);
      expect((await openRun(runsDir, id)).samples).toEqual(first.table);
      // The CSV is the truth: a row appended (a resumed log) makes the cache stale, and it is not used.
      await appendFile(csvPath, '500,10000001,ok\n');
      const third = await openSamples(csvPath, {}, (without) => readRunFolder(dir, { withoutSamples: without }));
      expect(third.source).toBe('csv');
      expect(third.table.rowCount).toBe(501);
      // Same size, other time (a rewrite in place): not used either.
      const info = await stat(csvPath);
      await utimes(csvPath, info.atime, new Date(info.mtimeMs + 5000));
      expect(
        (await openSamples(csvPath, {}, (without) => readRunFolder(dir, { withoutSamples: without }))).source,
      ).toBe('csv');
      // A torn cache file (cut in half) is ignored and replaced.
      const cachePath = join(dir, COLUMN_CACHE_FILE);
      const whole = await readFile(cachePath);
      await writeFile(cachePath, whole.subarray(0, whole.length >> 1));
      const fourth = await openSamples(csvPath, {}, (without) => readRunFolder(dir, { withoutSamples: without }));
      expect(fourth.source).toBe('csv');
      expect(fourth.table.rowCount).toBe(501);
      expect(
        (await openSamples(csvPath, {}, (without) => readRunFolder(dir, { withoutSamples: without }))).source,
      ).toBe('cache');
    });
  });

  it('caches no run that is still being written', async () => {
    await withTempDir(async (runsDir) => {
      const { dir } = await finishedRun(runsDir, 50, null);
      const csvPath = join(dir, 'samples.csv');
      expect(
        (await openSamples(csvPath, {}, (without) => readRunFolder(dir, { withoutSamples: without }))).source,
      ).toBe('csv');
      expect(
        (await openSamples(csvPath, {}, (without) => readRunFolder(dir, { withoutSamples: without }))).source,
      ).toBe('csv');
      await expect(stat(join(dir, COLUMN_CACHE_FILE))).rejects.toThrow();
    });
  });
  it('is built when a big run finishes, so its first opening reads the cache; small runs are left to their CSV', async () => {
    await withTempDir(async (runsDir) => {
      const small = await finishedRun(runsDir, CACHE_AT_FINISH_MIN_ROWS - 1);
      expect(await cacheFinishedRun(small.dir, CACHE_AT_FINISH_MIN_ROWS - 1)).toBe(false);
      await expect(stat(join(small.dir, COLUMN_CACHE_FILE))).rejects.toThrow();

      const big = await finishedRun(runsDir, CACHE_AT_FINISH_MIN_ROWS);
      expect(await cacheFinishedRun(big.dir, CACHE_AT_FINISH_MIN_ROWS)).toBe(true);
      const csvPath = join(big.dir, 'samples.csv');
      const first = await openSamples(csvPath, {}, (without) => readRunFolder(big.dir, { withoutSamples: without }));
      expect(first.source).toBe('cache');
      expect(first.table).toEqual(readSampleTable(await readFile(csvPath, 'utf8')));
      expect(first.table.rowCount).toBe(CACHE_AT_FINISH_MIN_ROWS);
    });
  });
});
