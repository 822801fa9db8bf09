/**
 * The summary printed after a run: the analysis (analyzeTable +
 * summarizeAnalysis) and, for a sweep, the gain table in Markdown. If the
 * analysis cannot be made (too few points, everything stalled…), a short
 * plain summary says why instead — the run folder is written either way.
 */
import { analyzeTable } from '../../app/analysis/analyze-table.ts';
import { summarizeAnalysis } from '../../app/analysis/analysis-summary.ts';
import { buildDatasheet } from '../../app/analysis/datasheet.ts';
import { runOrigin } from '../../app/analysis/datasheet-run.ts';
import { renderDatasheetMarkdown } from '../../app/analysis/datasheet-render.ts';
import { loadAnalysisSource } from './analysis-source.ts';
import type { ProcedureOutcome } from '../procedures/types.ts';

export interface RunSummary {
  /** Analysis in a few lines (or why there is none). */
  text: string;
  /** Markdown gain table (sweeps and pushing), or null. */
  tableMarkdown: string | null;
}

/**
 * `outcome`: the run's own outcome when it just ran; a counter fault then
 * replaces the analysis, since rows that are all errors say nothing about
 * the DUT (they are not a stall).
 */
export async function summarizeRun(
  dir: string,
  title?: string,
  outcome?: Pick<ProcedureOutcome, 'failure'>,
): Promise<RunSummary> {
  if (outcome?.failure?.kind === 'counter-fault')
    return { text: `no analysis: ${outcome.failure.message}\n`, tableMarkdown: null };
  try {
    const source = await loadAnalysisSource(dir);
    const analysis = analyzeTable(source.kind, source.table, {
      gateS: source.gateS,
      events: source.events ?? undefined,
      sweep: source.window ? { window: { ...source.window, source: 'plan' } } : undefined,
    });
    const text = summarizeAnalysis(analysis);
    const tableMarkdown =
      source.kind === 'drift'
        ? null
        : renderDatasheetMarkdown(
            // The run's own origin, as `tunebench datasheet` gives it: a simulated run says so; a stopped run still shows its own figures.
            buildDatasheet(
              [
                {
                  label: source.label,
                  analysis,
                  conditions: source.conditions,
                  origin: source.meta ? runOrigin(source.meta) : undefined,
                },
              ],
              title,
              { includeIncomplete: true },
            ),
          );
    return { text, tableMarkdown };
  } catch (error) {
    return { text: `no analysis: ${error instanceof Error ? error.message : String(error)}\n`, tableMarkdown: null };
  }
}
