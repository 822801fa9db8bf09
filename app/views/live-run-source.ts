/**
 * The live run as a plot source for the sweep and drift screens: readings
 * pulled from the live-run store, redraws on each new batch, "done" when the
 * run ends (the analysis runs then).
 */
import { planHints } from '../analysis/datasheet-run.ts';
import type { RunKind } from '../contract/bench-api.ts';
import { useStore } from '../state/use-store.ts';
import { useEffectiveTheme } from './App.tsx';
import { useApp } from './app-context.ts';
import type { SweepSource } from './sweep/SweepFigures.tsx';

/** Null until a run of this kind has started in this window. */
export function useLiveRunSource(kind: RunKind): SweepSource | null {
  const { stores } = useApp();
  const theme = useEffectiveTheme();
  const runId = useStore(stores.liveRun, (s) => (s.meta?.kind === kind ? s.meta.id : null));
  const active = useStore(stores.liveRun, (s) => s.active);
  const startedAt = useStore(stores.liveRun, (s) => (s.meta?.kind === kind ? s.meta.startedAt : null));
  const gateS = useStore(stores.liveRun, (s) => (s.meta?.kind === kind ? planHints(s.meta.plan).gateS : undefined));
  if (!runId) return null;
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
