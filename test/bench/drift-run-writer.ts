/**
 * A realistic, synthetic drift run folder for the big-run figures and tests
 * (issue 12 item 2): run.json and events.jsonl from the store's own writer,
 * then samples.csv written here in large blocks (the writer's per-row path
 * takes minutes for ten million rows). Nothing is committed: callers write
 * into a temporary folder.
 *
 * The oscillator (a scenario of our own): 400 MHz, warming up over the
 * first hour (−2 kHz decaying with τ = 1 h), −30 ppm/°C against a room
 * that swings ±1.5 °C over a day, white frequency noise of ±2.5 Hz; a
 * counter giving 1 mHz digits and a thermometer 0.01 °C; a two-minute
 * loss of signal every 12 hours (status no-signal, frequency empty).
 */
import { once } from 'node:events';
import { createWriteStream } from 'node:fs';
import { join } from 'node:path';
import { DRIFT_COLUMNS } from '../../main/procedures/drift.ts';
import { createRun } from '../../main/store/index.ts';
import { VirtualClock } from '../../main/time/virtual-clock.ts';

export interface SyntheticDriftOptions {
  runsDir: string;
  samples: number;
  /** Seconds between readings. Default 1/16 s (16 readings a second). */
  intervalS?: number;
  dutId?: string;
}

/** Rows per block handed to the file stream. */
const BLOCK_ROWS = 20_000;

export async function writeSyntheticDriftRun(options: SyntheticDriftOptions): Promise<string> {
  const intervalS = options.intervalS ?? 1 / 16;
  const samples = options.samples;
  const clock = new VirtualClock({ startWallIso: '2026-11-20T18:00:00.000Z' });
  const writer = await createRun({
    runsDir: options.runsDir,
    kind: 'drift',
    dut: { id: options.dutId ?? 'radio-lo-400m-c' },
    instruments: [
      { role: 'counter', idn: 'tunebench,SIM-COUNTER,0,0.1', address: 'sim' },
      { role: 'thermometer', idn: 'tunebench,SIM-THERMO,0,0.1', address: 'sim' },
    ],
    plan: {
      controlV: 2.5,
      intervalS,
      durationS: samples * intervalS,
      gateS: Math.min(0.1, intervalS / 2),
      limits: { maxControlV: 5, currentLimitA: 0.02 },
    },
    columns: DRIFT_COLUMNS,
    clock,
  });
  // The writer's heartbeat timers fire as the virtual clock moves to the end of the log.
  await clock.advance(samples * intervalS);
  await writer.finish('complete');
  const out = createWriteStream(join(options.runsDir, writer.id, 'samples.csv'));
  out.write(`${DRIFT_COLUMNS.join(',')}\n`);
  let seed = 12345;
  const noise = (): number => {
    seed = (seed * 1103515245 + 12345) % 2147483648;
    return seed / 2147483648 - 0.5;
  };
  const lossEvery = Math.round(43_200 / intervalS);
  const lossRows = Math.round(120 / intervalS);
  for (let start = 0; start < samples; start += BLOCK_ROWS) {
    const lines: string[] = [];
    for (let i = start; i < Math.min(samples, start + BLOCK_ROWS); i += 1) {
      const t = i * intervalS;
      const temperatureC = Math.round((23 + 1.5 * Math.sin((2 * Math.PI * t) / 86_400)) * 100) / 100;
      if (i % lossEvery >= lossEvery - lossRows) {
        lines.push(`${t},2.5,,${temperatureC},no-signal`);
        continue;
      }
      const warmUp = -2e3 * Math.exp(-t / 3600);
      const frequencyHz = 400e6 * (1 - 30e-6 * (temperatureC - 23)) + warmUp + 5 * noise();
      lines.push(`${t},2.5,${Math.round(frequencyHz * 1000) / 1000},${temperatureC},ok`);
    }
    if (!out.write(`${lines.join('\n')}\n`)) await once(out, 'drain');
  }
  out.end();
  await once(out, 'finish');
  return writer.id;
}
