/**
 * `tunebench datasheet RUN_DIR... [--format md|csv|html] [-o FILE]`
 */
import { writeFile } from 'node:fs/promises';
import { AnalysisError } from '../../app/analysis/analysis-error.ts';
import { analyzeTable } from '../../app/analysis/analyze-table.ts';
import { CsvError } from '../../app/analysis/csv-input.ts';
import { buildDatasheet, type DatasheetRun } from '../../app/analysis/datasheet.ts';
import { renderDatasheetCsv, renderDatasheetHtml, renderDatasheetMarkdown } from '../../app/analysis/datasheet-render.ts';
import { loadAnalysisSource } from './analysis-source.ts';
import { isCampaignDir, loadCampaignAnalysis } from './campaign-source.ts';
import { renderCampaignCsv, renderCampaignMarkdown } from '../../app/analysis/campaign-datasheet.ts';
import { parseFlags } from './flags.ts';
import { runsDirFrom } from '../bench/cli-session.ts';
import { UsageError, WorkFailedError, type CliCommand, type CliIo } from './types.ts';

const usage = `usage: tunebench datasheet RUN_DIR|RUN_ID... [--format md|csv|html] [-o FILE] [--title TEXT] [--runs DIR]

Builds the gain table (min / typ / max over the runs) from sweep, drift and
pushing runs — folders, or ids as \`tunebench runs\` prints them (plain CSV files
are accepted too). Given one campaign folder (tunebench campaign), it builds the
table over temperature, supply and units: per-temperature Kvco, tempcos, pushing
and tuning headroom (md or csv).

options:
  --format md|csv|html  output format (default md); html is one printable, self-contained page
  -o, --output FILE     write to FILE instead of standard output
  --title TEXT          heading of the table (default "VCO gain table")
  --runs DIR            runs folder where a RUN_ID is looked up (default: TUNEBENCH_RUNS, else the user data folder)
`;

const RENDER = { md: renderDatasheetMarkdown, csv: renderDatasheetCsv, html: renderDatasheetHtml } as const;

function isFormat(text: string): text is keyof typeof RENDER {
  return text === 'md' || text === 'csv' || text === 'html';
}

export const datasheetCommand: CliCommand = {
  name: 'datasheet',
  summary: 'gain table over one or more runs (Markdown, CSV or HTML)',
  usage,
  async run(argv, io) {
    const flags = parseFlags(argv, { values: ['format', 'output', 'title', 'runs'], aliases: { o: 'output' } });
    if (flags.positionals.length === 0) throw new UsageError('expected one or more RUN_DIR or RUN_ID (or FILE.csv)');
    const format = flags.values.get('format') ?? 'md';
    if (!isFormat(format)) throw new UsageError(`--format: "${format}" is not md, csv or html`);
    if (flags.positionals.length === 1 && (await isCampaignDir(flags.positionals[0] as string))) {
      if (format === 'html') throw new UsageError('--format: a campaign datasheet is md or csv');
      const { analysis } = await loadCampaignAnalysis(flags.positionals[0] as string);
      const text = format === 'csv' ? renderCampaignCsv(analysis) : renderCampaignMarkdown(analysis, flags.values.get('title'));
      return writeOut(text, flags.values.get('output'), io);
    }
    const runs: DatasheetRun[] = [];
    for (const path of flags.positionals) {
      const source = await loadAnalysisSource(path, runsDirFrom(flags.values.get('runs'), io));
      try {
        const analysis = analyzeTable(source.kind, source.table, { gateS: source.gateS });
        runs.push({ label: source.label, analysis, conditions: source.conditions });
      } catch (error) {
        if (error instanceof CsvError) throw new UsageError(`${path}: ${error.message}`);
        if (error instanceof AnalysisError) {
          if (error.workFailed) throw new WorkFailedError(`${path}: ${error.message}`);
          throw new UsageError(`${path}: ${error.message}`);
        }
        throw error;
      }
    }
    const text = RENDER[format](buildDatasheet(runs, flags.values.get('title')));
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
