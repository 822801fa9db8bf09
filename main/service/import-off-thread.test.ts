import { mkdtemp, readFile, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterEach, describe, expect, it } from 'vitest';
import { importCsvOffThread } from './import-off-thread.ts';

let dir = '';
afterEach(async () => {
  if (dir) await rm(dir, { recursive: true, force: true });
});

describe('CSV import off the main thread', () => {
  it('writes the same run folder as the store would, from a worker thread', async () => {
    dir = await mkdtemp(join(tmpdir(), 'tunebench-import-worker-'));
    const csv = 'control_v,frequency_hz\n0.5,1000\n1.0,2000\n1.5,3000\n';
    const meta = await importCsvOffThread({ runsDir: dir, fileName: 'bench.csv', csvText: csv, dutId: 'w1' });
    expect(meta.kind).toBe('sweep');
    expect(meta.dut.id).toBe('w1');
    const samples = await readFile(join(dir, meta.id, 'samples.csv'), 'utf8');
    expect(samples.trim().split('\n')).toHaveLength(4);
  }, 30_000);

  it('reports a refused file as an error naming the problem, not a crash', async () => {
    dir = await mkdtemp(join(tmpdir(), 'tunebench-import-worker-'));
    await expect(
      importCsvOffThread({ runsDir: dir, fileName: 'x.csv', csvText: 'no,numbers\nhere,either\n', dutId: 'w1' }),
    ).rejects.toThrow(/x\.csv|column|frequency/i);
  }, 30_000);
});
