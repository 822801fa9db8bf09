/**
 * The gain-table screen and `tunebench datasheet` must write the same files
 * from the same run folders: the screen reads a run through openRun +
 * columnSetFromStored and app/views/datasheet/run-analysis.ts, the command
 * through its own loader; both end in buildDatasheet and the shared renderers.
 */
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { buildDatasheet, type DatasheetRun } from '../../analysis/datasheet.ts';
import { renderDatasheetCsv, renderDatasheetHtml, renderDatasheetMarkdown } from '../../analysis/datasheet-render.ts';
import { columnSetFromStored } from '../../state/columns.ts';
import { datasheetRun } from './run-analysis.ts';
import { openRun } from '../../../main/store/run-store.ts';
import { createRun } from '../../../main/store/run-writer.ts';
import { withTempDir } from '../../../main/store/testing/temp-dir.ts';
import { VirtualClock } from '../../../main/time/virtual-clock.ts';
import { runCli } from '../../../main/cli/index.ts';
import { createBenchService } from '../../../main/service/bench-service.ts';
import { sweepPort, driftPort, storePort } from '../../../main/service/default-ports.ts';
import { openBench } from '../../../main/service/open-bench.ts';
import { ScaledClock } from '../../../main/time/scaled-clock.ts';
import { parseCallParams } from '../../contract/bench-api-schemas.ts';

async function cli(...argv: string[]): Promise<string> {
  let out = '';
  const io = { stdout: { write: (s: string) => ((out += s), true) }, stderr: { write: () => true }, env: {} };
  expect(await runCli(argv, io)).toBe(0);
  return out;
}

/** A sweep, a drift log and a pushing run of a made-up 400 MHz varactor VCO, with dead and failed readings. */
async function makeRuns(runsDir: string): Promise<string[]> {
  const clock = new VirtualClock({ startWallIso: '2026-12-01T08:00:00.000Z' });
  const sweep = await createRun({
    runsDir,
    kind: 'sweep',
    dut: { id: 'varactor-vco-7' },
    instruments: [],
    plan: { gateS: 0.1, supplyV: 5 },
    columns: ['time_s', 'control_v', 'frequency_hz', 'temperature_c', 'direction', 'status'],
    clock,
  });
  let t = 0;
  for (const direction of ['up', 'down']) {
    for (let k = 0; k <= 30; k++) {
      const v = direction === 'up' ? k * 0.15 : (30 - k) * 0.15;
      for (let r = 0; r < 3; r++) {
        // Stalled below 0.6 V; one timeout at 2.25 V that must not count as "no oscillation".
        const status = v < 0.6 ? 'no-signal' : k === 15 && r === 0 ? 'timeout' : 'ok';
        const f = status === 'ok' ? 380e6 + 12e6 * v - 4e5 * v * v + ((r * 37 + k * 11) % 7) * 10 : '';
        sweep.appendSample({
          time_s: t++,
          control_v: v,
          frequency_hz: f,
          temperature_c: 24.5 + 0.01 * (k % 5),
          direction,
          status,
        });
      }
    }
  }
  await sweep.finish('complete');
  const drift = await createRun({
    runsDir,
    kind: 'drift',
    dut: { id: 'varactor-vco-7' },
    instruments: [],
    plan: { gateS: 1, controlV: 2 },
    columns: ['time_s', 'control_v', 'frequency_hz', 'temperature_c', 'status'],
    clock,
  });
  for (let i = 0; i < 3600; i++) {
    const c = 25 + 2 * Math.sin((Math.PI * i) / 3600);
    const status = i % 500 === 7 ? 'error' : 'ok';
    drift.appendSample({
      time_s: i,
      control_v: 2,
      frequency_hz: status === 'ok' ? 4.0e8 - 800 * (c - 25) + (i % 3) : '',
      temperature_c: c,
      status,
    });
  }
  await drift.finish('complete');
  const pushing = await createRun({
    runsDir,
    kind: 'pushing',
    dut: { id: 'varactor-vco-7' },
    instruments: [],
    plan: { gateS: 0.1, controlV: 2 },
    columns: ['time_s', 'control_v', 'supply_v', 'frequency_hz', 'status'],
    clock,
  });
  t = 0;
  for (const supplyV of [4.5, 4.75, 5, 5.25, 5.5]) {
    for (let r = 0; r < 4; r++) {
      const status = supplyV === 4.75 && r === 1 ? 'timeout' : 'ok';
      pushing.appendSample({
        time_s: t++,
        control_v: 2,
        supply_v: supplyV,
        frequency_hz: status === 'ok' ? 4.0e8 + 2e3 * (supplyV - 5) + r : '',
        status,
      });
    }
  }
  await pushing.finish('complete');
  return [sweep.dir, drift.dir, pushing.dir];
}

/** A sweep that logged no temperature or supply column but recorded its conditions in run.json (as sweeps now do). */
async function makeSweepWithConditions(runsDir: string): Promise<string> {
  const clock = new VirtualClock({ startWallIso: '2026-12-02T08:00:00.000Z' });
  const sweep = await createRun({
    runsDir,
    kind: 'sweep',
    dut: { id: 'sensor-osc-4' },
    instruments: [],
    plan: { gateS: 0.1 },
    columns: ['time_s', 'control_v', 'frequency_hz', 'direction', 'status'],
    clock,
  });
  for (let k = 0; k <= 20; k++) {
    const v = 1 + k * 0.1;
    sweep.appendSample({
      time_s: k,
      control_v: v,
      frequency_hz: 1e5 + 2e4 * v + (k % 3),
      direction: 'up',
      status: 'ok',
    });
  }
  await sweep.finish('complete', {
    conditions: { dutSupplyV: { start: 4.999, end: 5.001 }, temperatureC: { start: 23.05, end: 23.15 } },
  });
  return sweep.dir;
}

/** The screen's table from run folders, as the gain-table screen builds it. */
async function screenSheet(runsDir: string, dirs: string[], title: string) {
  const runs: DatasheetRun[] = [];
  for (const dir of dirs) {
    const opened = await openRun(runsDir, dir.split('/').pop() ?? '');
    const columns = columnSetFromStored(opened.samples.numeric, opened.samples.text);
    const made = datasheetRun(opened.meta, columns, columns.time_s.length);
    expect(made.message).toBeNull();
    if (made.run) runs.push(made.run);
  }
  return buildDatasheet(runs, title);
}

describe('gain table: screen and command agree', () => {
  it('shows the conditions a sweep recorded in run.json (temperature, DUT supply, gate), the same on both', async () => {
    await withTempDir(async (runsDir) => {
      const dir = await makeSweepWithConditions(runsDir);
      const sheet = await screenSheet(runsDir, [dir], 'Sensor oscillator');
      const md = await cli('datasheet', dir, '--format', 'md', '--title', 'Sensor oscillator');
      expect(renderDatasheetMarkdown(sheet)).toBe(md);
      expect(renderDatasheetCsv(sheet)).toBe(
        await cli('datasheet', dir, '--format', 'csv', '--title', 'Sensor oscillator'),
      );
      expect(sheet.rows.find((r) => r.key === 'kvcoLine')?.conditions).toBe(
        'T 23.1 °C; supply 5.00 V; gate 100 ms; window 1.000 V … 3.000 V (usable range)',
      );
      expect(md).toContain('T 23.1 °C; supply 5.00 V; gate 100 ms');
    });
  });

  it('a sweep recorded by the app (the service) shows temperature and supply in its conditions, as the command does', async () => {
    // The reproduction: the app's runs had no run.json `conditions`, so the screen's column read only
    // "gate 100 ms" where `tunebench sweep` runs read "T 23.0 °C; supply 5.00 V; gate 100 ms".
    await withTempDir(async (runsDir) => {
      const clock = new ScaledClock(200);
      const service = createBenchService({
        runsDir,
        openBench: (config) => openBench(config, { clock, simClock: () => clock }),
        listSerialPorts: async () => [],
        listProfiles: async () => [],
        store: storePort(runsDir),
        procedures: { sweep: sweepPort, drift: driftPort },
        livePeriodMs: 50,
        batchMs: 100,
      });
      try {
        const ended = new Promise<void>((resolve) =>
          service.subscribe((event) => {
            if (event.type === 'run-ended') resolve();
          }),
        );
        await service.connect('sim');
        const plan = {
          start: 1.8,
          stop: 3.2,
          step: 0.2,
          readingsPerPoint: 2,
          gateS: 0.1,
          settle: { mode: 'fixed', seconds: 0.05 },
          refineEdgeV: 0,
          limits: { maxControlV: 5, currentLimitA: 0.02 },
        };
        const call = parseCallParams('startSweep', [plan, 'sensor-osc-9']);
        if (!call.ok) throw new Error(call.message);
        const meta = await service.startSweep(...(call.args as [never, string]));
        await ended;
        const detail = await service.openRun(meta.id);
        const columns = columnSetFromStored(detail.samples.numeric, detail.samples.text);
        const made = datasheetRun(detail.meta, columns, columns.time_s.length);
        expect(made.message).toBeNull();
        const sheet = buildDatasheet(made.run ? [made.run] : [], 'App sweep');
        const conditions = sheet.rows.find((r) => r.key === 'kvcoLine')?.conditions ?? '';
        expect(conditions).toMatch(/^T \d+\.\d °C; supply 5\.00 V; gate 100 ms/);
        expect(renderDatasheetMarkdown(sheet)).toBe(
          await cli('datasheet', join(runsDir, meta.id), '--format', 'md', '--title', 'App sweep'),
        );
      } finally {
        await service.close();
      }
    });
  });

  it('same CSV, Markdown and HTML from the same run folders (incl. no-signal, timeout and error rows)', async () => {
    await withTempDir(async (runsDir) => {
      const dirs = await makeRuns(runsDir);
      const runs: DatasheetRun[] = [];
      for (const dir of dirs) {
        const opened = await openRun(runsDir, dir.split('/').pop() ?? '');
        const columns = columnSetFromStored(opened.samples.numeric, opened.samples.text);
        const made = datasheetRun(opened.meta, columns, columns.time_s.length);
        expect(made.message).toBeNull();
        if (made.run) runs.push(made.run);
      }
      const sheet = buildDatasheet(runs, 'Varactor VCO');
      expect(sheet.rows.map((r) => r.key)).toEqual(expect.arrayContaining(['kvcoLine', 'stall', 'tempco', 'pushing']));
      expect(renderDatasheetCsv(sheet)).toBe(
        await cli('datasheet', ...dirs, '--format', 'csv', '--title', 'Varactor VCO'),
      );
      expect(renderDatasheetMarkdown(sheet)).toBe(
        await cli('datasheet', ...dirs, '--format', 'md', '--title', 'Varactor VCO'),
      );
      expect(renderDatasheetHtml(sheet)).toBe(
        await cli('datasheet', ...dirs, '--format', 'html', '--title', 'Varactor VCO'),
      );
    });
  });
});
