/**
 * The live run as a plot source for the sweep and drift screens: readings
 * pulled from the live-run store, redraws on each new batch, "done" when the
 * run ends (the analysis runs then).
 */
import { useEffect } from 'react';
import { planHints } from '../analysis/datasheet-run.ts';
import type { RunKind } from '../contract/bench-api.ts';
import { useStore } from '../state/use-store.ts';
import { useEffectiveTheme } from './use-theme.ts';
import { useApp } from './app-context.ts';
import type { SweepSource } from './sweep/SweepFigures.tsx';
import { when } from './units.ts';
import { heldLogOf, type HeldLog } from './drift/held-log.ts';

/**
 * The run of this kind in this window; failing that (a fresh window, a
 * reload) the newest stored one, so the screen keeps its context. Null when
 * there is neither.
 */
export function useLiveRunSource(kind: RunKind): (SweepSource & { held?: HeldLog }) | null {
  const { stores, bridge } = useApp();
  const latestStored = useStore(
    stores.runs,
    (s) => s.runs.find((run) => run.kind === kind && run.status !== 'running')?.id ?? null,
  );
  const opened = useStore(stores.runs, (s) => (latestStored ? s.opened[latestStored] : undefined));
  const theme = useEffectiveTheme();
  const runId = useStore(stores.liveRun, (s) => (s.meta?.kind === kind ? s.meta.id : null));
  const active = useStore(stores.liveRun, (s) => s.active);
  const startedAt = useStore(stores.liveRun, (s) => (s.meta?.kind === kind ? s.meta.startedAt : null));
  const gateS = useStore(stores.liveRun, (s) => (s.meta?.kind === kind ? planHints(s.meta.plan).gateS : undefined));
  const open = useStore(stores.runs, (s) => s.open);
  useEffect(() => {
    if (!runId && latestStored) void open(latestStored);
  }, [runId, latestStored, open]);
  if (!runId) {
    if (!opened) return null;
    const meta = opened.detail.meta;
    const hints = planHints(meta.plan);
    const held = heldLogOf(bridge.api, opened);
    return {
      ...(held ? { held } : {}),
      key: `${meta.id}|stored`,
      columns: () => opened.columns,
      rows: () => opened.rows,
      done: true,
      ...(hints.gateS !== undefined ? { gateS: hints.gateS } : {}),
      theme,
      startMs: Date.parse(meta.startedAt),
      storedFrom: `${meta.dut.id}, ${when(meta.startedAt)} (${meta.status})`,
    };
  }
  return {
    key: runId,
    columns: () => stores.liveRun.getState().columns,
    rows: () => stores.liveRun.getState().rows,
    watch: (notify) => stores.liveRun.subscribe((s, prev) => s.version !== prev.version && notify()),
    done: !active,
    startMs: startedAt ? Date.parse(startedAt) : null,
    ...(gateS !== undefined ? { gateS } : {}),
    theme,
  };
}
