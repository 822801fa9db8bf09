/** One saved run opened: rename, add a note, and its plots and figures. */
import { useState } from 'react';
import { planHints } from '../../analysis/datasheet-run.ts';
import { useStore } from '../../state/use-store.ts';
import { useApp } from '../app-context.ts';
import { Field, Panel } from '../controls/Field.tsx';
import { useEffectiveTheme } from '../use-theme.ts';
import { DriftFigures } from '../drift/DriftFigures.tsx';
import { heldLogOf } from '../drift/held-log.ts';
import { SweepFigures } from '../sweep/SweepFigures.tsx';
import { PushingFigures } from './PushingFigures.tsx';
import { when } from '../units.ts';
import { conditionRows, planRows, runWindow } from './run-facts.ts';
import type { PixelPreview, RunPreview } from '../../contract/run-preview.ts';
import { createColumnSet } from '../../state/columns.ts';
import type { ReactNode } from 'react';
import type { RunMeta } from '../../contract/bench-api.ts';

/** The frame of a run's detail, the same while its preview and once its full data show. */
function RunDetailPanel({ meta, onClose, children }: { meta: RunMeta; onClose: () => void; children: ReactNode }) {
  return (
    <Panel
      title={`${meta.dut.id} — ${meta.kind}, ${when(meta.startedAt)}`}
      testId="run-detail"
      actions={
        <button type="button" className="quiet" onClick={onClose} data-testid="run-close">
          Close
        </button>
      }
    >
      {children}
    </Panel>
  );
}

function FactsTable({
  caption,
  rows,
  empty,
  testId,
}: {
  caption: string;
  rows: [string, string][];
  empty: string;
  testId: string;
}) {
  return (
    <table className="table facts" data-testid={testId}>
      <caption>{caption}</caption>
      <tbody>
        {rows.length === 0 ? (
          <tr>
            <td>{empty}</td>
          </tr>
        ) : (
          rows.map(([key, value]) => (
            <tr key={key}>
              <th scope="row">{key}</th>
              <td>{value}</td>
            </tr>
          ))
        )}
      </tbody>
    </table>
  );
}

/** A big run while its full columns are on their way: its plot from the pixel preview, nothing else yet. */
function RunPreviewView({ id, shown, preview }: { id: string; shown: RunPreview; preview: PixelPreview }) {
  const { stores } = useApp();
  const theme = useEffectiveTheme();
  const focus = useStore(stores.runs, (s) => s.focus);
  const meta = shown.meta;
  const gateS = planHints(meta.plan).gateS;
  const empty = createColumnSet(1);
  const source = {
    key: `${meta.id}|preview`,
    columns: () => empty,
    rows: () => 0,
    done: false,
    theme,
    startMs: Date.parse(meta.startedAt),
    preview: { data: preview, rowCount: shown.rowCount },
    ...(gateS !== undefined ? { gateS } : {}),
  };
  return (
    <RunDetailPanel meta={meta} onClose={() => void focus(null)}>
      <p className="muted" data-testid="run-preview-status">
        {shown.rowCount.toLocaleString('en')} readings · status {meta.status} · {runWindow(meta)} · loading the full
        data of run {id}…
      </p>
      {meta.kind === 'drift' ? <DriftFigures source={source} /> : null}
    </RunDetailPanel>
  );
}

export function RunDetailView({ id }: { id: string }) {
  const { stores, bridge } = useApp();
  const theme = useEffectiveTheme();
  const opened = useStore(stores.runs, (s) => s.opened[id]);
  const preview = useStore(stores.runs, (s) => s.previews[id]);
  const rename = useStore(stores.runs, (s) => s.rename);
  const addNote = useStore(stores.runs, (s) => s.addNote);
  const focus = useStore(stores.runs, (s) => s.focus);
  const [name, setName] = useState<string | null>(null);
  const [note, setNote] = useState('');
  if (!opened && preview?.preview) return <RunPreviewView id={id} shown={preview} preview={preview.preview} />;
  if (!opened) return <p className="muted">Opening run…</p>;
  const meta = opened.detail.meta;
  const gateS = planHints(meta.plan).gateS;
  const held = heldLogOf(bridge.api, opened);
  const readings = held ? held.rowCount : opened.rows;
  const source = {
    key: `${meta.id}|${held ? 'held' : opened.rows}`,
    columns: () => opened.columns,
    rows: () => opened.rows,
    done: true,
    theme,
    startMs: Date.parse(meta.startedAt),
    ...(gateS !== undefined ? { gateS } : {}),
    ...(held ? { held } : {}),
  };
  // Notes may be recorded both in run.json and as events: show each text once.
  const noteTexts = [
    ...new Set([
      ...meta.dut.notes.split('\n'),
      ...opened.detail.events
        .filter((e) => e.type === 'note')
        .map((e) => (typeof e.text === 'string' ? e.text : typeof e.note === 'string' ? e.note : '')),
    ]),
  ].filter((text) => text.trim() !== '');
  return (
    <RunDetailPanel meta={meta} onClose={() => void focus(null)}>
      <div className="row">
        <Field label="DUT id" value={name ?? meta.dut.id} onChange={setName} inputMode="text" testId="rename-input" />
        <button
          type="button"
          disabled={name === null || name.trim() === '' || name === meta.dut.id}
          onClick={() => void rename(id, (name ?? '').trim()).then(() => setName(null))}
          data-testid="rename-run"
        >
          Rename
        </button>
      </div>
      <div className="row">
        <Field label="Add a note" value={note} onChange={setNote} inputMode="text" testId="note-input" />
        <button
          type="button"
          disabled={note.trim() === ''}
          onClick={() => void addNote(id, note.trim()).then(() => setNote(''))}
          data-testid="add-note"
        >
          Add note
        </button>
      </div>
      {noteTexts.length > 0 ? (
        <ul className="notes" data-testid="run-notes">
          {noteTexts.map((text) => (
            <li key={text}>{text}</li>
          ))}
        </ul>
      ) : null}
      <details className="run-facts" open data-testid="run-facts">
        <summary>
          {readings} readings · status {meta.status} · {runWindow(meta)}
        </summary>
        <div className="facts-grid">
          <FactsTable caption="Plan settings" rows={planRows(meta.plan)} empty="no plan recorded" testId="run-plan" />
          <div>
            <table className="table facts" data-testid="run-instruments">
              <caption>Instruments</caption>
              <tbody>
                {meta.instruments.length === 0 ? (
                  <tr>
                    <td>no instrument record (imported)</td>
                  </tr>
                ) : (
                  meta.instruments.map((i) => (
                    <tr key={i.role}>
                      <th scope="row">{i.role}</th>
                      <td>
                        <code>{i.idn}</code> at <code>{i.address}</code>
                      </td>
                    </tr>
                  ))
                )}
              </tbody>
            </table>
            <FactsTable
              caption="Conditions"
              rows={conditionRows(meta)}
              empty="not recorded for this run"
              testId="run-conditions"
            />
          </div>
        </div>
      </details>
      {meta.kind === 'sweep' ? <SweepFigures source={source} /> : null}
      {meta.kind === 'drift' ? <DriftFigures source={source} /> : null}
      {meta.kind === 'pushing' ? <PushingFigures source={source} /> : null}
    </RunDetailPanel>
  );
}
