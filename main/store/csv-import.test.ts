import { readdir } from 'node:fs/promises';
import { describe, expect, it } from 'vitest';
import { importCsvRun } from './csv-import.ts';
import { openRun } from './run-store.ts';
import { withTempDir } from './testing/temp-dir.ts';

describe('importCsvRun', () => {
  it('makes a complete run of the inferred kind that opens like any other', async () => {
    await withTempDir(async (runsDir) => {
      const meta = await importCsvRun({
        runsDir,
        fileName: 'varactor-400m.csv',
        csvText: 'control_v,frequency_hz\n1,3.8e8\n2,4.0e8\n3,4.15e8\n',
        dutId: '400 MHz varactor VCO',
        nowIso: '2026-12-02T01:00:00.000Z',
      });
      expect(meta).toMatchObject({
        id: '20261202-010000-400-mhz-varactor-vco',
        kind: 'sweep',
        status: 'complete',
        plan: { importedFrom: 'varactor-400m.csv' },
      });
      const run = await openRun(runsDir, meta.id);
      expect(run.samples.numeric.frequency_hz).toEqual(new Float64Array([3.8e8, 4.0e8, 4.15e8]));
      expect(run.events).toEqual([{ time_s: 0, type: 'imported', fileName: 'varactor-400m.csv', rows: 3 }]);
    });
  });

  it('writes nothing when the CSV is bad', async () => {
    await withTempDir(async (runsDir) => {
      await expect(
        importCsvRun({ runsDir, fileName: 'x.csv', csvText: 'control_v,frequency_hz\n1,abc\n', dutId: 'osc' }),
      ).rejects.toThrow(/x\.csv: line 2, column frequency_hz: "abc" is not a number/);
      await expect(readdir(runsDir)).resolves.toEqual([]);
    });
  });
});
