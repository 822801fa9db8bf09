/**
 * `tunebench analyze RUN_DIR|FILE.csv [--json] [--fit spline|poly:N|auto] [--fit-range all|usable|A:B] [--window A:B] [--keep-unsettled]`
 */
import { AnalysisError } from '../../app/analysis/analysis-error.ts';
import { summarizeAnalysis } from '../../app/analysis/analysis-summary.ts';
import { analyzeTableColumns, parseFitSpec, parseVoltRange } from '../../app/analysis/analyze-table.ts';
import type { SweepOptions } from '../../app/analysis/sweep-analysis.ts';
import { CsvError, numericColumn } from '../../app/analysis/csv-columns.ts';
import type { ColumnTable } from '../../app/contract/column-table.ts';
import { parseSiNumber } from '../../app/contract/si.ts';
import { loadAnalysisSource } from './analysis-source.ts';
import { isCampaignDir } from './campaign-dir.ts';
import { parseFlags, positiveFlag } from './flags.ts';
import { writeJsonChunks } from './json-chunks.ts';
import { runsDirFrom } from './runs-dir-flag.ts';
import { UsageError, WorkFailedError, type CliCommand } from './types.ts';
import { tuneForBigWork } from './v8-tuning.ts';

const usage = `usage: tunebench analyze RUN_DIR|RUN_ID|CAMPAIGN_DIR|FILE.csv [--runs DIR] [--json] [--fit spline|poly:N|auto] [--fit-range all|usable|A:B] [--window A:B]

Analyses a sweep, drift or pushing run (its folder, or its id as \`tunebench runs\`
prints it), or a plain CSV file:
  sweep CSV:   columns control_v, frequency_hz (rows sharing control_v are one point;
               empty, NaN, 0 or 9.91E37 = no oscillation); optional direction, status
  drift CSV:   columns time_s, frequency_hz, optional temperature_c
  pushing CSV: columns supply_v, frequency_hz
  campaign folder (campaign.json): every condition's sweep, tempcos, pushing, headroom

options:
  --json            machine-readable result (keys in resources/docs/reference.md, "analyze --json")
  --fit spline|poly:N|auto  tuning-curve model: penalised cubic regression spline (default; smoothing by
                    generalised cross-validation, monotone where the data allow), polynomial degree 1–6,
                    or a polynomial of the degree AICc picks
  --fit-range all|usable|A:B  points the model is fitted to: the automatic usable range (default; the
                    window when one is given), every oscillating point, or A…B volts (e.g. 1.2:3.8)
  --window A:B      tuning window the PLL can drive, volts: Kvco min/typ/max and linearity are taken
                    over it (default: the plan's window, else the usable range); refused outside the
                    measured oscillating range
  --keep-unsettled  keep points that hit the settle timeout in the fit (default: left out, with a note)
  --linearity-limit PCT  limit for the widest linear range, ± % of span (default 5)
  --nominal V       control voltage of the nominal point for Kvco, inside the measured range
                    (default: middle of the usable range)
  --runs DIR        runs folder where a RUN_ID is looked up (default: TUNEBENCH_RUNS, else the user data folder)
`;

function positiveNumber(text: string | undefined, flag: string, form: string): number | undefined {
  return positiveFlag(flag, text, parseSiNumber, (got) => `"${got}" is not ${form}`);
}

/** Kvco at a control voltage nobody measured would be an extrapolation of the fit: refused. */
function checkNominalInside(nominalV: number, table: ColumnTable): void {
  let lo = Infinity;
  let hi = -Infinity;
  try {
    const v = numericColumn(table, 'control_v');
    const f = numericColumn(table, 'frequency_hz');
    if (v === null || f === null) return;
    for (let i = 0; i < table.rowCount; i++) {
      if (!((f[i] as number) > 0 && (f[i] as number) < 9e37)) continue; // no oscillation there
      lo = Math.min(lo, v[i] as number);
      hi = Math.max(hi, v[i] as number);
    }
  } catch (error) {
    if (error instanceof CsvError) return; // the analysis reports the bad cell with its line
    throw error;
  }
  if (lo <= hi && (nominalV < lo || nominalV > hi)) {
    throw new UsageError(
      `--nominal: ${nominalV} V is outside the measured range ${lo}–${hi} V (where the DUT oscillated); Kvco there would be extrapolated`,
    );
  }
}

export const analyzeCommand: CliCommand = {
  name: 'analyze',
  usage,
  async run(argv, io) {
    const flags = parseFlags(argv, {
      values: ['fit', 'linearity-limit', 'nominal', 'fit-range', 'window', 'runs'],
      booleans: ['json', 'keep-unsettled'],
    });
    if (flags.positionals.length !== 1) throw new UsageError('expected one RUN_DIR, RUN_ID or FILE.csv');
    const fitText = flags.values.get('fit') ?? 'spline';
    const fit = parseFitSpec(fitText);
    if (fit === null) throw new UsageError(`--fit: "${fitText}" is not spline, poly:N (N = 1…6) or auto`);
    const rangeText = flags.values.get('fit-range');
    let fitRange: SweepOptions['fitRange'];
    if (rangeText === 'all' || rangeText === 'usable') fitRange = rangeText;
    else if (rangeText !== undefined) {
      const r = parseVoltRange(rangeText, parseSiNumber);
      if (!r)
        throw new UsageError(`--fit-range: "${rangeText}" is not all, usable or A:B volts with A < B (e.g. 1.2:3.8)`);
      fitRange = r;
    }
    const windowText = flags.values.get('window');
    let flagWindow: { fromV: number; toV: number } | undefined;
    if (windowText !== undefined) {
      const r = parseVoltRange(windowText, parseSiNumber);
      if (!r) throw new UsageError(`--window: "${windowText}" is not A:B volts with A < B (e.g. 0.5:2.8)`);
      flagWindow = r;
    }
    const linearityLimitPct = positiveNumber(
      flags.values.get('linearity-limit'),
      'linearity-limit',
      'a percentage > 0 (e.g. 5)',
    );
    const nominalV = positiveNumber(flags.values.get('nominal'), 'nominal', 'a voltage > 0 (e.g. 1.5 or 1500m)');
    if (await isCampaignDir(flags.positionals[0] as string)) {
      tuneForBigWork();
      // Loaded only for a campaign folder: an ordinary run or CSV needs none of it.
      const { loadCampaignAnalysis } = await import('./campaign-source.ts');
      const { renderCampaignMarkdown } = await import('../../app/analysis/campaign-datasheet.ts');
      const { file, analysis } = await loadCampaignAnalysis(flags.positionals[0] as string);
      if (flags.booleans.has('json'))
        io.stdout.write(
          `${JSON.stringify({ ...analysis, campaign: { id: file.id, status: file.status } }, null, 2)}\n`,
        );
      else io.stdout.write(`campaign ${file.id}, status ${file.status}\n${renderCampaignMarkdown(analysis)}`);
      return 0;
    }
    const source = await loadAnalysisSource(flags.positionals[0] as string, runsDirFrom(flags.values.get('runs'), io));
    if (nominalV !== undefined && source.kind === 'sweep') checkNominalInside(nominalV, source.table);
    let result;
    try {
      const window: SweepOptions['window'] = flagWindow
        ? { ...flagWindow, source: 'flag' }
        : source.window
          ? { ...source.window, source: 'plan' }
          : undefined;
      // Columns: a sweep of a million points is written from them, never made into objects.
      result = analyzeTableColumns(source.kind, source.table, {
        gateS: source.gateS,
        events: source.events ?? undefined,
        sweep: {
          fit,
          linearityLimitPct,
          nominalV,
          fitRange,
          window,
          keepUnsettled: flags.booleans.has('keep-unsettled'),
        },
      });
    } catch (error) {
      if (error instanceof CsvError) throw new UsageError(`${source.path}: ${error.message}`);
      if (error instanceof AnalysisError) {
        if (error.workFailed) throw new WorkFailedError(`${source.path}: ${error.message}`);
        throw new UsageError(`${source.path}: ${error.message}`);
      }
      throw error;
    }
    if (flags.booleans.has('json')) {
      const out = source.meta
        ? {
            ...result,
            run: {
              id: source.meta.id,
              status: source.meta.status,
              dutId: source.meta.dut.id,
              eventsByType: source.eventsByType,
              droppedLines: source.droppedLines,
            },
          }
        : result;
      writeJsonChunks(out, (text) => io.stdout.write(text));
      io.stdout.write('\n');
    } else {
      if (source.meta) io.stdout.write(`run ${source.label}, status ${source.meta.status}\n`);
      if (source.droppedLines > 0)
        io.stdout.write(
          `samples.csv: ${source.droppedLines} damaged line(s) left out (a line a crash tore, or a broken one)\n`,
        );
      io.stdout.write(summarizeAnalysis(result));
    }
    return 0;
  },
};
