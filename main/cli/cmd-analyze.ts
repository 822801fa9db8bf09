/**
 * `tunebench analyze RUN_DIR|FILE.csv [--json] [--fit poly:N|auto]`
 */
import { AnalysisError } from '../../app/analysis/analysis-error.ts';
import { summarizeAnalysis } from '../../app/analysis/analysis-summary.ts';
import { analyzeTable, parseFitSpec } from '../../app/analysis/analyze-table.ts';
import { CsvError } from '../../app/analysis/csv-input.ts';
import { parseSiNumber } from '../../app/contract/si.ts';
import { loadAnalysisSource } from './analysis-source.ts';
import { isCampaignDir, loadCampaignAnalysis } from './campaign-source.ts';
import { renderCampaignMarkdown } from '../../app/analysis/campaign-datasheet.ts';
import { parseFlags, positiveFlag } from './flags.ts';
import { UsageError, WorkFailedError, type CliCommand } from './types.ts';

const usage = `usage: tunebench analyze RUN_DIR|CAMPAIGN_DIR|FILE.csv [--json] [--fit poly:N|auto]

Analyses a sweep, drift or pushing run folder, or a plain CSV file:
  sweep CSV:   columns control_v, frequency_hz (rows sharing control_v are one point;
               empty, NaN, 0 or 9.91E37 = no oscillation); optional direction, status
  drift CSV:   columns time_s, frequency_hz, optional temperature_c
  pushing CSV: columns supply_v, frequency_hz
  campaign folder (campaign.json): every condition's sweep, tempcos, pushing, headroom

options:
  --json            machine-readable result (keys as documented in CONTRACTS.md)
  --fit poly:N|auto polynomial degree 1–6 for the tuning curve, or auto (AICc; default)
  --linearity-limit PCT  limit for the widest linear range, ± % of span (default 5)
  --nominal V       control voltage of the nominal point for Kvco (default: middle of the usable range)
`;

function positiveNumber(text: string | undefined, flag: string, form: string): number | undefined {
  return positiveFlag(flag, text, parseSiNumber, (got) => `"${got}" is not ${form}`);
}

export const analyzeCommand: CliCommand = {
  name: 'analyze',
  summary: 'analyse a sweep, drift or pushing run (or a plain CSV)',
  usage,
  async run(argv, io) {
    const flags = parseFlags(argv, { values: ['fit', 'linearity-limit', 'nominal'], booleans: ['json'] });
    if (flags.positionals.length !== 1) throw new UsageError('expected one RUN_DIR or FILE.csv');
    const fitText = flags.values.get('fit') ?? 'auto';
    const fit = parseFitSpec(fitText);
    if (fit === null) throw new UsageError(`--fit: "${fitText}" is not poly:N (N = 1…6) or auto`);
    const linearityLimitPct = positiveNumber(flags.values.get('linearity-limit'), 'linearity-limit', 'a percentage > 0 (e.g. 5)');
    const nominalV = positiveNumber(flags.values.get('nominal'), 'nominal', 'a voltage > 0 (e.g. 1.5 or 1500m)');
    if (await isCampaignDir(flags.positionals[0] as string)) {
      const { file, analysis } = await loadCampaignAnalysis(flags.positionals[0] as string);
      if (flags.booleans.has('json')) io.stdout.write(`${JSON.stringify({ ...analysis, campaign: { id: file.id, status: file.status } }, null, 2)}\n`);
      else io.stdout.write(`campaign ${file.id}, status ${file.status}\n${renderCampaignMarkdown(analysis)}`);
      return 0;
    }
    const source = await loadAnalysisSource(flags.positionals[0] as string);
    let result;
    try {
      result = analyzeTable(source.kind, source.table, { gateS: source.gateS, sweep: { fit, linearityLimitPct, nominalV } });
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
        ? { ...result, run: { id: source.meta.id, status: source.meta.status, dutId: source.meta.dut.id, eventsByType: source.eventsByType } }
        : result;
      io.stdout.write(`${JSON.stringify(out, null, 2)}\n`);
    } else {
      if (source.meta) io.stdout.write(`run ${source.label}, status ${source.meta.status}\n`);
      io.stdout.write(summarizeAnalysis(result));
    }
    return 0;
  },
};
