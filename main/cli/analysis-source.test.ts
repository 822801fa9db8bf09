import { stat } from 'node:fs/promises';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { analyzeTable } from '../../app/analysis/analyze-table.ts';
import { COLUMN_CACHE_FILE } from '../store/column-cache.ts';
import { createRun } from '../store/run-writer.ts';
import { readRunFolder } from '../store/run-reader.ts';
import { readSampleTable } from '../store/sample-table.ts';
import { withTempDir } from '../store/testing/temp-dir.ts';
import { VirtualClock } from '../time/virtual-clock.ts';
import { loadAnalysisSource } from './analysis-source.ts';

describe('loadAnalysisSource of a run folder', () => {
  it('reads samples through the column cache and gives the same table and figures as the CSV', async () => {
    await withTempDir(async (runsDir) => {
      const writer = await createRun({
        runsDir,
        kind: 'drift',
        dut: { id: 'cache-analyze-osc' },
        instruments: [],
        plan: { controlV: 1.2, intervalS: 1, durationS: 3000 },
        columns: ['time_s', 'control_v', 'frequency_hz', 'temperature_c', 'status'],
        clock: new VirtualClock({ startWallIso: '2026-12-02T08:00:00Z' }),
      });
      for (let i = 0; i < 3000; i++) {
        const temperatureC = 25 + Math.sin(i / 500);
        writer.appendSample([i, 1.2, 5e6 * (1 - 20e-6 * (temperatureC - 25)) + (i % 5) * 0.1, temperatureC, 'ok']);
      }
      await writer.finish('complete');
      const dir = join(runsDir, writer.id);
      const fromCsv = readSampleTable((await readRunFolder(dir)).samplesCsv);

      const first = await loadAnalysisSource(dir);
      expect((await stat(join(dir, COLUMN_CACHE_FILE))).size).toBeGreaterThan(3000 * 8);
      const second = await loadAnalysisSource(dir); // now from the cache
      for (const source of [first, second]) {
        expect(source.kind).toBe('drift');
        expect(source.table.rowCount).toBe(3000);
        expect(source.table.numeric).toEqual(fromCsv.numeric);
        expect(analyzeTable(source.kind, source.table, {})).toEqual(analyzeTable('drift', fromCsv, {}));
      }
    });
  });
});
