/**
 * `tunebench datasheet RUN_DIR... [--format md|csv|html] [-o FILE] [--window A:B] [--include-incomplete] [--allow-mixed]`
 */
import { writeFile } from 'node:fs/promises';
import { AnalysisError } from '../../app/analysis/analysis-error.ts';
import { analyzeTable, parseVoltRange } from '../../app/analysis/analyze-table.ts';
import { runOrigin } from '../../app/analysis/datasheet-run.ts';
import { parseSiNumber } from '../../app/contract/si.ts';
import { CsvError } from '../../app/analysis/csv-columns.ts';
import { buildDatasheet, DatasheetInputError, type DatasheetRun } from '../../app/analysis/datasheet.ts';
import {
  renderDatasheetCsv,
  renderDatasheetHtml,
  renderDatasheetMarkdown,
} from '../../app/analysis/datasheet-render.ts';
import { loadAnalysisSource } from './analysis-source.ts';
import { isCampaignDir, loadCampaignAnalysis } from './campaign-source.ts';
import {
  renderCampaignCsv,
  renderCampaignHtml,
  renderCampaignMarkdown,
} from '../../app/analysis/campaign-datasheet.ts';
import { parseFlags } from './flags.ts';
import { runsDirFrom } from './runs-dir-flag.ts';
import { UsageError, WorkFailedError, type CliCommand, type CliIo } from './types.ts';

const usage = `usage: tunebench datasheet RUN_DIR|RUN_ID... [--format md|csv|html] [-o FILE] [--title TEXT] [--window A:B] [--runs DIR]
                          [--include-incomplete] [--allow-mixed]

Builds the gain table (min / typ / max over the runs) from sweep, drift and
pushing runs — folders, or ids as \`tunebench runs\` prints them (plain CSV files
are accepted too). Given one campaign
folder (tunebench campaign), it builds the table over temperature, supply and
units: per-temperature Kvco, tempcos, pushing and tuning headroom (md, csv or html).

options:
  --format md|csv|html  output format (default md); html is one printable, self-contained page
  -o, --output FILE     write to FILE instead of standard output
  --title TEXT          heading of the table (default "VCO gain table")
  --window A:B          tuning window (volts) Kvco min/max/line are quoted over, for every sweep
                        (default: each run's plan window, else its usable range)
  --include-incomplete  keep aborted and interrupted runs (default: left out, named in the notes)
  --allow-mixed         allow runs of different DUTs (id, kind, or tuning ranges that do not overlap)
  --runs DIR            runs folder where a RUN_ID is looked up (default: TUNEBENCH_RUNS, else the user data folder)
`;

const RENDER = { md: renderDatasheetMarkdown, csv: renderDatasheetCsv, html: renderDatasheetHtml } as const;

function isFormat(text: string): text is keyof typeof RENDER {
  return text === 'md' || text === 'csv' || text === 'html';
}

export const datasheetCommand: CliCommand = {
  name: 'datasheet',
  usage,
  async run(argv, io) {
    const flags = parseFlags(argv, {
      values: ['format', 'output', 'title', 'window', 'runs'],
      booleans: ['include-incomplete', 'allow-mixed'],
      aliases: { o: 'output' },
    });
    if (flags.positionals.length === 0) throw new UsageError('expected one or more RUN_DIR or RUN_ID (or FILE.csv)');
    const format = flags.values.get('format') ?? 'md';
    if (!isFormat(format)) throw new UsageError(`--format: "${format}" is not md, csv or html`);
    if (flags.positionals.length === 1 && (await isCampaignDir(flags.positionals[0] as string))) {
      const { analysis } = await loadCampaignAnalysis(flags.positionals[0] as string);
      const title = flags.values.get('title');
      const text =
        format === 'csv'
          ? renderCampaignCsv(analysis)
          : format === 'html'
            ? renderCampaignHtml(analysis, title)
            : renderCampaignMarkdown(analysis, title);
      return writeOut(text, flags.values.get('output'), io);
    }
    const windowText = flags.values.get('window');
    const flagWindow = windowText === undefined ? undefined : parseVoltRange(windowText, parseSiNumber);
    if (flagWindow === null)
      throw new UsageError(`--window: "${windowText}" is not A:B volts with A < B (e.g. 0.5:2.8)`);
    const runs: DatasheetRun[] = [];
    for (const path of flags.positionals) {
      const source = await loadAnalysisSource(path, runsDirFrom(flags.values.get('runs'), io));
      try {
        const window = flagWindow
          ? { ...flagWindow, source: 'flag' as const }
          : source.window
            ? { ...source.window, source: 'plan' as const }
            : undefined;
        // No events here: the gain-table screen builds the same table from samples alone (parity test).
        const analysis = analyzeTable(source.kind, source.table, { gateS: source.gateS, sweep: { window } });
        runs.push({
          label: source.label,
          analysis,
          conditions: source.conditions,
          origin: source.meta ? runOrigin(source.meta) : undefined,
        });
      } catch (error) {
        if (error instanceof CsvError) throw new UsageError(`${path}: ${error.message}`);
        if (error instanceof AnalysisError) {
          if (error.workFailed) throw new WorkFailedError(`${path}: ${error.message}`);
          throw new UsageError(`${path}: ${error.message}`);
        }
        throw error;
      }
    }
    let sheet;
    try {
      sheet = buildDatasheet(runs, flags.values.get('title'), {
        includeIncomplete: flags.booleans.has('include-incomplete'),
        allowMixed: flags.booleans.has('allow-mixed'),
      });
    } catch (error) {
      if (error instanceof DatasheetInputError) throw new UsageError(error.message);
      throw error;
    }
    const text = RENDER[format](sheet);
    return writeOut(text, flags.values.get('output'), io);
  },
};

async function writeOut(text: string, output: string | undefined, io: CliIo): Promise<number> {
  if (output) {
    try {
      await writeFile(output, text, 'utf8');
    } catch (error) {
      throw new UsageError(`-o ${output}: cannot write (${(error as Error).message})`);
    }
    io.stderr.write(`wrote ${output}\n`);
  } else {
    io.stdout.write(text);
  }
  return 0;
}
