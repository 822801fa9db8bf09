/** Run archive: saved runs, open one, overlay sweeps, rename, notes, delete with undo, import CSV. */
import { useEffect, useRef, useState } from 'react';
import type uPlot from 'uplot';
import type { RunMeta } from '../../contract/bench-api.ts';
import { PlotPanel } from '../../plots/PlotPanel.tsx';
import { coarsestReadout, counterReadout, voltsReadout } from '../../plots/readout.ts';
import { baseOptions, lineSeries, pointSeries, siAxis, xSeries } from '../../plots/plot-options.ts';
import { useStore } from '../../state/use-store.ts';
import { useApp } from '../app-context.ts';
import { Field, Panel } from '../controls/Field.tsx';
import { useEffectiveTheme } from '../use-theme.ts';
import { when } from '../units.ts';
import { Choice } from '../controls/Field.tsx';
import { analyzeColumns } from '../sweep/sweep-figures.ts';
import { planHints } from '../../analysis/datasheet-run.ts';
import {
  archiveRows,
  kvcoText,
  NO_FILTER,
  type ArchiveFilter,
  type ArchiveSort,
  type ArchiveSortKey,
} from './archive-view.ts';
import { differenceColumns, pointMeans } from './difference.ts';
import { overlayColumns } from './overlay.ts';
import { RunDetailView } from './RunDetailView.tsx';
import { RunZip } from './RunZip.tsx';

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
        <label htmlFor="import-csv-file">
          Import a CSV (control_v, frequency_hz — or time_s, frequency_hz, temperature_c)
        </label>
        <input
          id="import-csv-file"
          ref={fileRef}
          type="file"
          accept=".csv,text/csv"
          data-testid="import-csv"
          onChange={(e) => void onFile(e.target.files?.[0])}
        />
      </div>
      {message ? (
        <p className="muted" role="status">
          {message}
        </p>
      ) : null}
    </div>
  );
}

/** Kvco (best-line slope) of finished sweeps, worked out one at a time in the background as the archive shows them. */
const kvcoCache = new Map<string, number | null>();
/** Each Kvco's 1σ, so the column shows only the digits it supports. */
const kvcoUncertainty = new Map<string, number>();

function useArchiveKvco(runs: readonly RunMeta[]): ReadonlyMap<string, number> {
  const { stores } = useApp();
  const open = useStore(stores.runs, (s) => s.open);
  const [version, setVersion] = useState(0);
  const pending = runs.filter((r) => r.kind === 'sweep' && r.status !== 'running' && !kvcoCache.has(r.id)).slice(0, 40);
  const pendingKey = pending.map((r) => r.id).join(',');
  useEffect(() => {
    let cancelled = false;
    void (async () => {
      for (const id of pendingKey ? pendingKey.split(',') : []) {
        if (cancelled) return;
        const opened = await open(id);
        if (!opened) {
          kvcoCache.set(id, null);
          continue;
        }
        const outcome = analyzeColumns(opened.columns, opened.rows, planHints(opened.detail.meta.plan).gateS);
        kvcoCache.set(id, outcome.ok ? outcome.analysis.kvco.linear.slopeHzPerV : null);
        if (outcome.ok) kvcoUncertainty.set(id, outcome.analysis.kvco.linear.slopeUncertaintyHzPerV);
        // Let the page breathe between runs.
        await new Promise((resolve) => setTimeout(resolve, 0));
      }
      if (!cancelled && pendingKey) setVersion((v) => v + 1);
    })();
    return () => {
      cancelled = true;
    };
  }, [pendingKey, open]);
  const known = new Map<string, number>();
  for (const [id, value] of kvcoCache) if (value !== null) known.set(id, value);
  void version;
  return known;
}

function RunRow({
  run,
  picked,
  focused,
  kvco,
}: {
  run: RunMeta;
  picked: boolean;
  focused: boolean;
  kvco: number | undefined;
}) {
  const { stores } = useApp();
  const togglePick = useStore(stores.runs, (s) => s.togglePick);
  const focus = useStore(stores.runs, (s) => s.focus);
  const remove = useStore(stores.runs, (s) => s.remove);
  return (
    <tr data-testid={`run-row-${run.id}`} className={focused ? 'focused' : undefined}>
      <td>
        <input
          type="checkbox"
          checked={picked}
          onChange={() => togglePick(run.id)}
          aria-label={`Pick ${run.dut.id} (${run.kind})`}
          data-testid={`run-pick-${run.id}`}
        />
      </td>
      <td>{run.dut.id}</td>
      <td>{run.kind}</td>
      <td>{when(run.startedAt)}</td>
      <td>
        <span className={`status status-${run.status}`}>{run.status}</span>
      </td>
      <td className="num" data-testid={`run-kvco-${run.id}`}>
        {run.kind === 'sweep' ? (kvco === undefined ? '…' : kvcoText(kvco, kvcoUncertainty.get(run.id))) : ''}
      </td>
      <td className="row-actions">
        <button type="button" onClick={() => void focus(run.id)} data-testid={`run-open-${run.id}`}>
          Open
        </button>
        <button
          type="button"
          className="danger quiet"
          onClick={() => void remove(run.id)}
          data-testid={`run-delete-${run.id}`}
        >
          Delete
        </button>
      </td>
    </tr>
  );
}

function Overlay({ ids }: { ids: string[] }) {
  const { stores } = useApp();
  const [referenceId, setReferenceId] = useState<string>('');
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
  // Each run's readings to its own counter's 1/gate; shared read-outs (cursors, differences) to the coarsest.
  const readings = loaded.map((r) => counterReadout(planHints(r.detail.meta.plan).gateS));
  const coarsest = coarsestReadout(readings);
  const refIndex = Math.max(
    0,
    loaded.findIndex((r) => r.detail.meta.id === referenceId),
  );
  const means = loaded.map((r) => pointMeans(r.columns, r.rows));
  const others = means.map((m, i) => ({ m, i })).filter(({ i }) => i !== refIndex);
  const diff = differenceColumns(
    means[refIndex] ?? { v: [], hz: [] },
    others.map(({ m }) => m),
  );
  return (
    <>
      <Choice
        label="Reference run for the difference plot"
        value={loaded[refIndex]?.detail.meta.id ?? ''}
        options={loaded.map((r, i) => ({ value: r.detail.meta.id, label: labels[i] ?? r.detail.meta.id }))}
        onChange={setReferenceId}
        testId="overlay-reference"
      />
      <PlotPanel
        testId="overlay-plot"
        title="Picked sweeps, frequency against control voltage"
        buildKey={`${sweeps.join(',')}|${theme}`}
        height={320}
        data={() => [merged.x, ...merged.ys] as uPlot.AlignedData}
        options={(colors, width, height) =>
          baseOptions(
            width,
            height,
            [
              xSeries('Control', voltsReadout),
              ...labels.map((label, i) =>
                pointSeries(label, colors.series[i % colors.series.length] ?? colors.text, readings[i] ?? coarsest, {
                  points: { show: true, size: 5 },
                }),
              ),
            ],
            [siAxis(colors, 'Control voltage', 'V'), siAxis(colors, 'Frequency', 'Hz', { size: 84 })],
          )
        }
        cursorReadouts={{ x: voltsReadout, y: coarsest }}
      />
      <PlotPanel
        testId="difference-plot"
        title={`Difference from ${labels[refIndex] ?? 'the reference'} (run − reference, reference interpolated between its setpoints)`}
        buildKey={`${sweeps.join(',')}|${theme}|diff|${refIndex}`}
        height={240}
        data={() => [diff.x, ...diff.ys] as uPlot.AlignedData}
        options={(colors, width, height) =>
          baseOptions(
            width,
            height,
            [
              xSeries('Control', voltsReadout),
              ...others.map(({ i }) =>
                lineSeries(labels[i] ?? '', colors.series[i % colors.series.length] ?? colors.text, coarsest, {
                  points: { show: true, size: 5 },
                  spanGaps: true,
                }),
              ),
            ],
            [siAxis(colors, 'Control voltage', 'V'), siAxis(colors, 'Difference', 'Hz', { size: 84 })],
          )
        }
        cursorReadouts={{ x: voltsReadout, y: coarsest }}
      />
    </>
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
  const [filter, setFilter] = useState<ArchiveFilter>(NO_FILTER);
  const [sort, setSort] = useState<ArchiveSort>({ key: 'started', descending: true });
  const kvco = useArchiveKvco(runs);
  const shown = archiveRows(runs, filter, sort, kvco);
  const sortHeader = (key: ArchiveSortKey, label: string) => (
    <th scope="col" aria-sort={sort.key === key ? (sort.descending ? 'descending' : 'ascending') : 'none'}>
      <button
        type="button"
        className="sort-button"
        onClick={() =>
          setSort({ key, descending: sort.key === key ? !sort.descending : key === 'started' || key === 'kvco' })
        }
        data-testid={`runs-sort-${key}`}
      >
        {label}
        {sort.key === key ? (sort.descending ? ' ▾' : ' ▴') : ''}
      </button>
    </th>
  );
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
        <div className="row archive-filter" data-testid="runs-filter">
          <Field
            label="DUT or note contains"
            value={filter.text}
            onChange={(text) => setFilter({ ...filter, text })}
            inputMode="text"
            testId="runs-filter-text"
          />
          <Choice
            label="Kind"
            value={filter.kind}
            options={[
              { value: 'all', label: 'All kinds' },
              { value: 'sweep', label: 'Gain sweeps' },
              { value: 'drift', label: 'Drift logs' },
              { value: 'pushing', label: 'Supply pushing' },
            ]}
            onChange={(kind) => setFilter({ ...filter, kind })}
            testId="runs-filter-kind"
          />
          <Choice
            label="Status"
            value={filter.status}
            options={[
              { value: 'all', label: 'Any status' },
              { value: 'complete', label: 'Complete' },
              { value: 'aborted', label: 'Aborted' },
              { value: 'interrupted', label: 'Interrupted' },
              { value: 'running', label: 'Running' },
              { value: 'failed', label: 'Failed' },
            ]}
            onChange={(status) => setFilter({ ...filter, status })}
            testId="runs-filter-status"
          />
          <Field
            label="From (YYYY-MM-DD)"
            value={filter.from}
            onChange={(from) => setFilter({ ...filter, from })}
            inputMode="text"
            testId="runs-filter-from"
          />
          <Field
            label="To (YYYY-MM-DD)"
            value={filter.to}
            onChange={(to) => setFilter({ ...filter, to })}
            inputMode="text"
            testId="runs-filter-to"
          />
        </div>
        <table className="table runs" data-testid="runs-list">
          <thead>
            <tr>
              <th scope="col">Pick</th>
              {sortHeader('dut', 'DUT')}
              {sortHeader('kind', 'Kind')}
              {sortHeader('started', 'Started')}
              {sortHeader('status', 'Status')}
              {sortHeader('kvco', 'Kvco (best line)')}
              <th scope="col">
                <span className="sr-only">Actions</span>
              </th>
            </tr>
          </thead>
          <tbody>
            {shown.length === 0 ? (
              <tr>
                <td colSpan={7} className="muted">
                  {runs.length === 0 ? 'No saved runs yet.' : 'No run matches the filter.'}
                </td>
              </tr>
            ) : (
              shown.map((run) => (
                <RunRow
                  key={run.id}
                  run={run}
                  picked={picked.includes(run.id)}
                  focused={run.id === focusId}
                  kvco={kvco.get(run.id)}
                />
              ))
            )}
          </tbody>
        </table>
        <ImportCsv />
        <RunZip />
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
