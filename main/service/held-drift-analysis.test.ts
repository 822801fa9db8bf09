/**
 * A big drift log's figures computed in main (app/analysis/drift-run-view.ts,
 * what `analyzeRun` sends) are the very numbers the page computed when it
 * held every reading (app/workers/analysis-jobs.ts driftJob + runJob, the
 * tempco plot's chunk means, the time plot's CSV): checked on a real drift
 * log of the simulated bench (a thermometer on a sinusoidal room, a counter
 * with its ±1 count), read back through the store, and after the reply's
 * trip through JSON and its wire schema.
 */
import { mkdtemp, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, expectTypeOf, it } from 'vitest';
import { planHints } from '../../app/analysis/datasheet-run.ts';
import {
  driftAnalysisJob,
  driftCsvPart,
  driftDisplayColumns,
  runDriftAnalysis,
} from '../../app/analysis/drift-run-view.ts';
import type { DriftAnalysis } from '../../app/analysis/drift-analysis.ts';
import type { RunDetail } from '../../app/contract/bench-api.ts';
import { driftPlanSchema } from '../../app/contract/plans.ts';
import { resultSchemas } from '../../app/contract/wire-schemas.ts';
import type { DriftAnalysisData } from '../../app/contract/run-window.ts';
import { columnSetFromStored } from '../../app/state/columns.ts';
import { driftJob, runJob } from '../../app/workers/analysis-jobs.ts';
import { tempcoColumns } from '../../app/views/drift/drift-figures.ts';
import { columnsCsv } from '../../app/analysis/csv-cells.ts';
import { GapDisplay } from '../../app/plots/gap-display.ts';
import { assembleBench } from '../bench/assemble.ts';
import { recordDrift } from '../procedures/recorded-run.ts';
import { openRun } from '../store/index.ts';
import { VirtualClock } from '../time/virtual-clock.ts';
import { analyzeOffThread } from './drift-analysis-off-thread.ts';
import { createRunOpener } from './run-opener.ts';

let scratch = '';
let detail: RunDetail;

beforeAll(async () => {
  scratch = await mkdtemp(join(tmpdir(), 'tunebench-held-analysis-'));
  const clock = new VirtualClock({ autoAdvance: true });
  // A room swinging ±2 °C over 20 minutes: the log has a tempco to fit.
  const bench = await assembleBench('sim', {
    clock,
    sim: { dut: 'varactor', ambient: { kind: 'sinusoid', meanC: 24, amplitudeC: 2, periodS: 1200 } },
  });
  try {
    const recorded = await clock.runUntil(
      recordDrift({
        bench,
        clock,
        plan: driftPlanSchema.parse({
          controlV: 2,
          intervalS: 0.5,
          durationS: 1500,
          gateS: 0.1,
          limits: { maxControlV: 5, currentLimitA: 0.02 },
        }),
        runsDir: scratch,
        dutId: 'held-check',
      }),
    );
    expect(recorded.meta.status).toBe('complete');
    detail = await openRun(scratch, recorded.meta.id);
  } finally {
    await bench.close();
  }
}, 120_000);

afterAll(async () => {
  await rm(scratch, { recursive: true, force: true });
});

function pageSide(d: RunDetail): { analysis: DriftAnalysis; tempco: ReturnType<typeof tempcoColumns>; csv: string } {
  const columns = columnSetFromStored(d.samples.numeric, d.samples.text);
  const n = columns.time_s.length;
  const outcome = runJob(driftJob(columns, n, planHints(d.meta.plan).gateS));
  if (!outcome.ok || outcome.analysis.kind !== 'drift') throw new Error('the page-side analysis failed');
  const freq = new GapDisplay(columns.frequency_hz, columns.status);
  const temp = new GapDisplay(columns.temperature_c, columns.status);
  return {
    analysis: outcome.analysis,
    tempco: tempcoColumns(columns, n, outcome.analysis),
    csv: columnsCsv(
      ['time_s', 'frequency_hz', 'temperature_c'],
      [columns.time_s.view().subarray(0, n), freq.data(n), temp.data(n)],
    ),
  };
}

function tableOf(d: RunDetail) {
  const numeric = d.samples.numeric as Record<string, Float64Array>;
  const text = d.samples.text as Record<string, { levels: string[]; codes: Uint8Array }>;
  return { names: d.samples.names, numeric, text, rowCount: d.samples.rowCount ?? 0 };
}

describe('a drift log analysed in main gives the figures the page gave', () => {
  it('the same analysis, tempco points and CSV, number for number, on a simulated bench log', () => {
    const page = pageSide(detail);
    expect(page.analysis.samples).toBeGreaterThan(2500);
    expect(page.analysis.tempcoHzPerC).not.toBeNull();
    expect(page.analysis.adev.length).toBeGreaterThan(5);
    const columns = driftDisplayColumns(tableOf(detail));
    const main = runDriftAnalysis(driftAnalysisJob(columns, planHints(detail.meta.plan).gateS));
    // The reply as the page receives it: through JSON and the wire schema.
    const wire = resultSchemas.analyzeRun.parse(JSON.parse(JSON.stringify(main)));
    expect(wire).toEqual(main);
    expect(main.outcome).toEqual({ ok: true, analysis: page.analysis });
    expect(main.tempco).toEqual(page.tempco);
    expect(main.holdV).toBe(detail.samples.numeric.control_v?.[0]);
    const csv = [0, 1000, 2000, 3000].map((from) => driftCsvPart(columns, from, 1000).text).join('');
    expect(csv).toBe(page.csv);
  });

  it('the wire schema describes the analysis type field for field', () => {
    expectTypeOf<DriftAnalysisData>().toEqualTypeOf<DriftAnalysis>();
  });

  it('in a worker thread through the opener, once per held log', async () => {
    const page = pageSide(detail);
    let reads = 0;
    // The simulated log is short of the preview threshold: the opener holds it on first ask, as after a restart.
    const opener = createRunOpener(async () => {
      reads += 1;
      return detail;
    }, analyzeOffThread);
    const [a, b] = await Promise.all([opener.analysis(detail.meta.id), opener.analysis(detail.meta.id)]);
    expect(a).toBe(b);
    expect(reads).toBe(1);
    expect(a.outcome).toEqual({ ok: true, analysis: page.analysis });
  }, 60_000);
});
