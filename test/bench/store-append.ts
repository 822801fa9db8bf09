/**
 * Run store throughput: rows appended per second through RunWriter (format +
 * buffer, hot path), and the cost of writing them out (one write per flush,
 * as a 1 s flush period would batch them), plus reading them back.
 * Run alone: `npx tsx test/bench/store-append.ts`.
 */
import { mkdtemp, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { performance } from 'node:perf_hooks';
import { readRunFolder } from '../../main/store/run-reader.ts';
import { createRun } from '../../main/store/run-writer.ts';
import { parseSamplesCsv } from '../../main/store/samples-csv.ts';
import { VirtualClock } from '../../main/time/virtual-clock.ts';

export async function benchStoreAppend(rows = 500_000, rowsPerFlush = 1000): Promise<string[]> {
  const runsDir = await mkdtemp(join(tmpdir(), 'tunebench-bench-'));
  try {
    const clock = new VirtualClock();
    const writer = await createRun({
      runsDir,
      kind: 'sweep',
      dut: { id: 'bench-osc' },
      instruments: [],
      plan: {},
      columns: ['time_s', 'control_v', 'control_meas_v', 'frequency_hz', 'direction', 'status'],
      clock,
    });
    const row: (number | string)[] = [0, 0, 0, 0, 'up', 'ok'];
    let appendMs = 0;
    let flushMs = 0;
    for (let i = 0; i < rows; i += rowsPerFlush) {
      const t0 = performance.now();
      for (let j = i; j < i + rowsPerFlush && j < rows; j++) {
        row[0] = j * 0.013;
        row[1] = 0.5 + (j % 400) * 0.01;
        row[2] = row[1] + 1.234e-4;
        row[3] = 8.192e6 + Math.sin(j) * 1234.5678;
        writer.appendSample(row);
      }
      const t1 = performance.now();
      await writer.flush();
      flushMs += performance.now() - t1;
      appendMs += t1 - t0;
    }
    const f0 = performance.now();
    await writer.finish('complete');
    const finishMs = performance.now() - f0;
    const r0 = performance.now();
    const run = await readRunFolder(writer.dir);
    const parsed = parseSamplesCsv(run.samplesCsv);
    const readMs = performance.now() - r0;
    if (parsed.rowCount !== rows) throw new Error(`read back ${parsed.rowCount} rows, wrote ${rows}`);
    const mb = run.samplesCsv.length / 1e6;
    return [
      `store: appendSample ${(rows / (appendMs / 1000)).toFixed(0)} rows/s (${((appendMs * 1000) / rows).toFixed(2)} µs/row, format + buffer)`,
      `store: append + write-out ${(rows / ((appendMs + flushMs) / 1000)).toFixed(0)} rows/s (${rowsPerFlush} rows per flush, ${((flushMs * 1000) / rows).toFixed(2)} µs/row writing)`,
      `store: finish (fsync + run.json atomic replace) ${finishMs.toFixed(1)} ms`,
      `store: read + parse ${rows} rows (${mb.toFixed(1)} MB) ${readMs.toFixed(0)} ms = ${(rows / (readMs / 1000)).toFixed(0)} rows/s`,
    ];
  } finally {
    await rm(runsDir, { recursive: true, force: true });
  }
}

if (import.meta.url === `file://${process.argv[1]}`) {
  for (const line of await benchStoreAppend()) console.log(line);
}
