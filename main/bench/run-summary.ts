/**
 * The summary printed after a run: the analysis (C's analyzeTable +
 * summarizeAnalysis) and, for a sweep, the gain table in Markdown. If the
 * analysis cannot be made (too few points, everything stalled…), a short
 * plain summary says why instead — the run folder is written either way.
 */
import { analyzeTable } from '../../app/analysis/analyze-table.ts';
import { summarizeAnalysis } from '../../app/analysis/analysis-summary.ts';
import { buildDatasheet } from '../../app/analysis/datasheet.ts';
import { renderDatasheetMarkdown } from '../../app/analysis/datasheet-render.ts';
import { loadAnalysisSource } from '../cli/analysis-source.ts';

export interface RunSummary {
  /** Analysis in a few lines (or why there is none). */
  text: string;
  /** Markdown gain table (sweeps and pushing), or null. */
  tableMarkdown: string | null;
}

export async function summarizeRun(dir: string, title?: string): Promise<RunSummary> {
  try {
    const source = await loadAnalysisSource(dir);
    const analysis = analyzeTable(source.kind, source.table, {
      gateS: source.gateS,
      events: source.events ?? undefined,
      sweep: source.window ? { window: { ...source.window, source: 'plan' } } : undefined,
    });
    const text = summarizeAnalysis(analysis);
    const tableMarkdown = source.kind === 'drift' ? null : renderDatasheetMarkdown(buildDatasheet([{ label: source.label, analysis, conditions: source.conditions }], title));
    return { text, tableMarkdown };
  } catch (error) {
    return { text: `no analysis: ${error instanceof Error ? error.message : String(error)}\n`, tableMarkdown: null };
  }
}
