/** Gain table: pick runs, see min/typ/max with conditions and units, export or print. */
import { useEffect, useMemo, useState } from 'react';
import { buildDatasheet, type DatasheetRun } from '../../analysis/datasheet.ts';
import {
  displayRow,
  renderDatasheetCsv,
  renderDatasheetHtml,
  renderDatasheetMarkdown,
} from '../../analysis/datasheet-render.ts';
import { errorText } from '../../bridge/bench-call-error.ts';
import { useStore } from '../../state/use-store.ts';
import { useApp } from '../app-context.ts';
import { Field, Panel } from '../controls/Field.tsx';
import { when } from '../units.ts';
import { downloadText } from './download.ts';
import { datasheetRun } from './run-analysis.ts';

function fileStem(title: string): string {
  return (
    title
      .trim()
      .replace(/[^A-Za-z0-9._-]+/g, '-')
      .replace(/^-+|-+$/g, '') || 'gain-table'
  );
}

export function DatasheetScreen() {
  const { bridge, stores } = useApp();
  const runs = useStore(stores.runs, (s) => s.runs);
  const picked = useStore(stores.runs, (s) => s.picked);
  const opened = useStore(stores.runs, (s) => s.opened);
  const togglePick = useStore(stores.runs, (s) => s.togglePick);
  const open = useStore(stores.runs, (s) => s.open);
  const [title, setTitle] = useState('VCO gain table');
  const [includeIncomplete, setIncludeIncomplete] = useState(false);
  const [allowMixed, setAllowMixed] = useState(false);
  const [printMessage, setPrintMessage] = useState<string | null>(null);
  const usable = runs.filter((r) => r.status !== 'running');
  const missingKey = picked.filter((id) => !opened[id]).join(',');
  useEffect(() => {
    if (missingKey) for (const id of missingKey.split(',')) void open(id);
  }, [missingKey, open]);

  const { sheet, problems } = useMemo(() => {
    const sheetRuns: DatasheetRun[] = [];
    const messages: string[] = [];
    for (const id of picked) {
      const run = opened[id];
      if (!run) continue;
      const made = datasheetRun(run.detail.meta, run.columns, run.rows);
      if (made.run) sheetRuns.push(made.run);
      if (made.message) messages.push(made.message);
    }
    if (sheetRuns.length === 0) return { sheet: null, problems: messages };
    try {
      return {
        sheet: buildDatasheet(sheetRuns, title.trim() || 'VCO gain table', { includeIncomplete, allowMixed }),
        problems: messages,
      };
    } catch (error) {
      // A table over runs of different DUTs is refused unless allowed: say why instead of a table.
      return {
        sheet: null,
        problems: [
          ...messages,
          error instanceof Error
            ? error.message.replace('(--allow-mixed)', '(tick "Allow mixed DUTs")')
            : String(error),
        ],
      };
    }
  }, [picked, opened, title, includeIncomplete, allowMixed]);

  const stem = fileStem(title);
  const printPdf = async () => {
    setPrintMessage(null);
    if (bridge.api.printDatasheetPdf) {
      try {
        const result = await bridge.api.printDatasheetPdf(`${stem}.pdf`);
        setPrintMessage(result.savedTo ? `Saved ${result.savedTo}` : 'Not saved.');
      } catch (error) {
        setPrintMessage(errorText(error));
      }
    } else {
      // Browser mode: the browser's own print dialog offers "Save as PDF".
      window.print();
    }
  };

  return (
    <div className="screen screen-datasheet">
      <Panel title="Runs in the table" testId="datasheet-runs" className="no-print">
        {usable.length === 0 ? <p className="muted">No finished runs yet: run a sweep or a drift log first.</p> : null}
        <ul className="pick-list">
          {usable.map((run) => (
            <li key={run.id}>
              <label>
                <input
                  type="checkbox"
                  checked={picked.includes(run.id)}
                  onChange={() => togglePick(run.id)}
                  data-testid={`datasheet-pick-${run.id}`}
                />
                {run.dut.id} · {run.kind} · {when(run.startedAt)} · {run.status}
              </label>
            </li>
          ))}
        </ul>
      </Panel>
      <section className="panel datasheet" aria-label="Gain table" data-testid="datasheet">
        <div className="no-print">
          <Field label="Title" value={title} onChange={setTitle} inputMode="text" testId="datasheet-title" />
          <label className="toggle">
            <input
              type="checkbox"
              checked={includeIncomplete}
              onChange={(e) => setIncludeIncomplete(e.target.checked)}
              data-testid="datasheet-include-incomplete"
            />
            Include incomplete runs (aborted, interrupted)
          </label>
          <label className="toggle">
            <input
              type="checkbox"
              checked={allowMixed}
              onChange={(e) => setAllowMixed(e.target.checked)}
              data-testid="datasheet-allow-mixed"
            />
            Allow mixed DUTs
          </label>
        </div>
        <h2 className="print-only">{title}</h2>
        {sheet?.simulated ? (
          <p className="simulated-banner" data-testid="datasheet-simulated">
            <strong>Simulated bench:</strong> figures from the built-in simulator, not from hardware.
          </p>
        ) : null}
        {problems.map((p) => (
          <p key={p} className="error-line" role="alert">
            {p}
          </p>
        ))}
        {sheet ? (
          <>
            <table className="table" data-testid="datasheet-table">
              <thead>
                <tr>
                  <th scope="col">Parameter</th>
                  <th scope="col">Conditions</th>
                  <th scope="col" className="num">
                    Min
                  </th>
                  <th scope="col" className="num">
                    Typ
                  </th>
                  <th scope="col" className="num">
                    Max
                  </th>
                  <th scope="col">Unit</th>
                </tr>
              </thead>
              <tbody>
                {sheet.rows.map((row) => {
                  // The same cells as the Markdown and HTML files.
                  const shown = displayRow(row);
                  return (
                    <tr key={row.key} data-testid={`datasheet-row-${row.key}`}>
                      <th scope="row">{row.parameter}</th>
                      <td>{row.conditions}</td>
                      <td className="num">{shown.min}</td>
                      <td className="num">{shown.typ}</td>
                      <td className="num">{shown.max}</td>
                      <td>{shown.unit}</td>
                    </tr>
                  );
                })}
              </tbody>
            </table>
            <ul className="notes muted">
              {sheet.notes.map((n) => (
                <li key={n}>{n}</li>
              ))}
            </ul>
            <div className="actions no-print">
              <button
                type="button"
                onClick={() => downloadText(`${stem}.csv`, renderDatasheetCsv(sheet), 'text/csv')}
                data-testid="datasheet-export-csv"
              >
                Save CSV
              </button>
              <button
                type="button"
                onClick={() => downloadText(`${stem}.md`, renderDatasheetMarkdown(sheet), 'text/markdown')}
                data-testid="datasheet-export-md"
              >
                Save Markdown
              </button>
              <button
                type="button"
                onClick={() => downloadText(`${stem}.html`, renderDatasheetHtml(sheet), 'text/html')}
                data-testid="datasheet-export-html"
              >
                Save HTML
              </button>
              <button type="button" onClick={() => void printPdf()} data-testid="datasheet-print-pdf">
                {bridge.api.printDatasheetPdf ? 'Save as PDF…' : 'Print (or save as PDF)…'}
              </button>
            </div>
            {printMessage ? (
              <p className="muted" role="status">
                {printMessage}
              </p>
            ) : null}
          </>
        ) : (
          <p className="muted">
            {picked.length > 0 ? 'Reading the picked runs…' : 'Pick one or more runs to build the table.'}
          </p>
        )}
      </section>
    </div>
  );
}
