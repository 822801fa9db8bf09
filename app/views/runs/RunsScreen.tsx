/** Run archive: saved runs, open one, overlay sweeps, rename, notes, delete with undo, import CSV. */
import { useEffect, useRef, useState } from 'react';
import type uPlot from 'uplot';
import type { RunMeta } from '../../contract/bench-api.ts';
import { PlotPanel } from '../../plots/PlotPanel.tsx';
import { baseOptions, pointSeries, siAxis, xSeries } from '../../plots/plot-options.ts';
import { useStore } from '../../state/use-store.ts';
import { useApp } from '../app-context.ts';
import { Field, Panel } from '../controls/Field.tsx';
import { useEffectiveTheme } from '../use-theme.ts';
import { when } from '../units.ts';
import { overlayColumns } from './overlay.ts';
import { RunDetailView } from './RunDetailView.tsx';

function ImportCsv() {
  const { stores } = useApp();
  const importCsv = useStore(stores.runs, (s) => s.importCsv);
  const focus = useStore(stores.runs, (s) => s.focus);
  const fileRef = useRef<HTMLInputElement | null>(null);
  const [dutId, setDutId] = useState('imported-vco');
  const [message, setMessage] = useState<string | null>(null);
  const onFile = async (file: File | undefined) => {
    if (!file) return;
    const meta = await importCsv(file.name, await file.text(), dutId.trim() || 'imported');
    setMessage(meta ? `Imported ${file.name} as a ${meta.kind} run.` : null);
    if (meta) await focus(meta.id);
    if (fileRef.current) fileRef.current.value = '';
  };
  return (
    <div className="import-row">
      <Field label="DUT id for the import" value={dutId} onChange={setDutId} inputMode="text" testId="import-dut-id" />
      <div className="field">
        <label htmlFor="import-csv-file">Import a CSV (control_v, frequency_hz — or time_s, frequency_hz, temperature_c)</label>
        <input id="import-csv-file" ref={fileRef} type="file" accept=".csv,text/csv" data-testid="import-csv" onChange={(e) => void onFile(e.target.files?.[0])} />
      </div>
      {message ? <p className="muted" role="status">{message}</p> : null}
    </div>
  );
}

function RunRow({ run, picked, focused }: { run: RunMeta; picked: boolean; focused: boolean }) {
  const { stores } = useApp();
  const togglePick = useStore(stores.runs, (s) => s.togglePick);
  const focus = useStore(stores.runs, (s) => s.focus);
  const remove = useStore(stores.runs, (s) => s.remove);
  return (
    <tr data-testid={`run-row-${run.id}`} className={focused ? 'focused' : undefined}>
      <td>
        <input type="checkbox" checked={picked} onChange={() => togglePick(run.id)} aria-label={`Pick ${run.dut.id} (${run.kind})`} data-testid={`run-pick-${run.id}`} />
      </td>
      <td>{run.dut.id}</td>
      <td>{run.kind}</td>
      <td>{when(run.startedAt)}</td>
      <td>
        <span className={`status status-${run.status}`}>{run.status}</span>
      </td>
      <td className="row-actions">
        <button type="button" onClick={() => void focus(run.id)} data-testid={`run-open-${run.id}`}>
          Open
        </button>
        <button type="button" className="danger quiet" onClick={() => void remove(run.id)} data-testid={`run-delete-${run.id}`}>
          Delete
        </button>
      </td>
    </tr>
  );
}

function Overlay({ ids }: { ids: string[] }) {
  const { stores } = useApp();
  const theme = useEffectiveTheme();
  const opened = useStore(stores.runs, (s) => s.opened);
  const runs = useStore(stores.runs, (s) => s.runs);
  const open = useStore(stores.runs, (s) => s.open);
  const sweeps = ids.filter((id) => runs.find((r) => r.id === id)?.kind === 'sweep');
  const missing = sweeps.filter((id) => !opened[id]);
  const missingKey = missing.join(',');
  useEffect(() => {
    if (missingKey) for (const id of missingKey.split(',')) void open(id);
  }, [missingKey, open]);
  if (missing.length > 0) {
    return <p className="muted">Loading picked runs…</p>;
  }
  if (sweeps.length < 2) return <p className="muted">Pick two or more sweeps to overlay them.</p>;
  const loaded = sweeps.map((id) => opened[id]).filter((r) => r !== undefined);
  const merged = overlayColumns(loaded.map((r) => ({ columns: r.columns, rows: r.rows })));
  const labels = loaded.map((r) => `${r.detail.meta.dut.id} · ${when(r.detail.meta.startedAt)}`);
  return (
    <PlotPanel
      testId="overlay-plot"
      title="Picked sweeps, frequency against control voltage"
      buildKey={`${sweeps.join(',')}|${theme}`}
      height={320}
      data={() => [merged.x, ...merged.ys] as uPlot.AlignedData}
      options={(colors, width, height) =>
        baseOptions(width, height, [xSeries('V', 'Control'), ...labels.map((label, i) => pointSeries(label, colors.series[i % colors.series.length] ?? colors.text, 'Hz', { points: { show: true, size: 5 } }))], [siAxis(colors, 'Control voltage', 'V'), siAxis(colors, 'Frequency', 'Hz', { size: 84 })])
      }
    />
  );
}

export function RunsScreen() {
  const { stores } = useApp();
  const runs = useStore(stores.runs, (s) => s.runs);
  const picked = useStore(stores.runs, (s) => s.picked);
  const focusId = useStore(stores.runs, (s) => s.focusId);
  const lastDeleted = useStore(stores.runs, (s) => s.lastDeleted);
  const error = useStore(stores.runs, (s) => s.error);
  const undo = useStore(stores.runs, (s) => s.undoRemove);
  const refresh = useStore(stores.runs, (s) => s.refresh);
  return (
    <div className="screen screen-runs">
      <Panel
        title="Saved runs"
        testId="runs-panel"
        actions={
          <button type="button" className="quiet" onClick={() => void refresh()} data-testid="runs-refresh">
            Reload list
          </button>
        }
      >
        {lastDeleted ? (
          <div className="undo-bar" role="status">
            Deleted {lastDeleted.dut.id} ({lastDeleted.kind}).
            <button type="button" onClick={() => void undo()} data-testid="undo-delete">
              Undo
            </button>
          </div>
        ) : null}
        {error ? (
          <p className="error-line" role="alert" data-testid="runs-error">
            {error}
          </p>
        ) : null}
        <table className="table runs" data-testid="runs-list">
          <thead>
            <tr>
              <th scope="col">Pick</th>
              <th scope="col">DUT</th>
              <th scope="col">Kind</th>
              <th scope="col">Started</th>
              <th scope="col">Status</th>
              <th scope="col">
                <span className="sr-only">Actions</span>
              </th>
            </tr>
          </thead>
          <tbody>
            {runs.length === 0 ? (
              <tr>
                <td colSpan={6} className="muted">
                  No saved runs yet.
                </td>
              </tr>
            ) : (
              runs.map((run) => <RunRow key={run.id} run={run} picked={picked.includes(run.id)} focused={run.id === focusId} />)
            )}
          </tbody>
        </table>
        <ImportCsv />
      </Panel>
      {picked.length > 0 ? (
        <Panel title="Overlay" testId="overlay-panel">
          <Overlay ids={picked} />
        </Panel>
      ) : null}
      {focusId ? <RunDetailView id={focusId} /> : null}
    </div>
  );
}
