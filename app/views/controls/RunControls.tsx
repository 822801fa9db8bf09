/** Start / pause / resume / stop for the run in progress, and its progress bar with ETA. */
import { useEffect, useRef, useState } from 'react';
import type { RunKind } from '../../contract/bench-api.ts';
import { errorText } from '../../bridge/bench-call-error.ts';
import { useStore } from '../../state/use-store.ts';
import { useApp } from '../app-context.ts';
import { clockTime, safeStateWords } from '../status-text.ts';
import { duration, supplyVolts } from '../units.ts';
import { ConfirmAction } from './ConfirmAction.tsx';
import { shownEta as nextShownEta, type ShownEta } from './eta.ts';

export interface RunControlsProps {
  kind: RunKind;
  startLabel: string;
  startTestId: string;
  /** Null when the plan is not valid yet. */
  start: (() => Promise<unknown>) | null;
}

const PHASE_TEXT: Record<string, string> = {
  settling: 'settling',
  reading: 'reading',
  refining: 'refining the stall edge',
  logging: 'logging',
  paused: 'paused',
  finishing: 'finishing',
};

export function RunControls(props: RunControlsProps) {
  const { bridge, stores } = useApp();
  const active = useStore(stores.liveRun, (s) => s.active);
  const activeKind = useStore(stores.liveRun, (s) => s.meta?.kind ?? null);
  const paused = useStore(stores.liveRun, (s) => s.paused);
  const setPaused = useStore(stores.liveRun, (s) => s.setPaused);
  const connected = useStore(stores.connection, (s) => s.connection.connected);
  const plan = useStore(stores.liveRun, (s) => s.meta?.plan);
  const [error, setError] = useState<string | null>(null);
  const [pending, setPending] = useState(false);
  const pauseRef = useRef<HTMLButtonElement | null>(null);
  /**
   * Set by Start, Pause and Resume: the keyboard goes (back) to the Pause/Resume button once it can take it.
   * Each of them is disabled while its call is out, which drops the focus to the page.
   */
  const pauseWantsFocus = useRef(false);
  const mineNow = active && activeKind === props.kind;
  // After Start the keyboard lands on Pause, the next thing one may need. Start turns disabled while the
  // call is out, which drops its focus to the page; Pause is enabled only once the call has returned and
  // the run is ours, so wait for both (the run can be announced before the call returns).
  useEffect(() => {
    const pause = pauseRef.current;
    if (!pauseWantsFocus.current || !mineNow || pending || !pause || pause.disabled) return;
    pauseWantsFocus.current = false;
    const at = document.activeElement;
    if (at === null || at === document.body || (at instanceof HTMLButtonElement && at.disabled)) pause.focus();
  }, [mineNow, pending, paused]);

  const act = async (work: () => Promise<unknown>) => {
    setError(null);
    setPending(true);
    try {
      await work();
    } catch (e) {
      setError(errorText(e));
    } finally {
      setPending(false);
    }
  };
  const mine = active && activeKind === props.kind;
  const start = props.start;
  return (
    <div className="run-controls">
      <div className="actions">
        <button
          type="button"
          className="primary big"
          disabled={!start || active || pending || !connected}
          onClick={() => {
            if (!start) return;
            pauseWantsFocus.current = true;
            void act(start);
          }}
          data-testid={props.startTestId}
        >
          {props.startLabel}
        </button>
        {/* One button that flips between Pause and Resume, so the keyboard focus stays on it across a pause. */}
        <button
          type="button"
          ref={pauseRef}
          disabled={!mine || pending}
          onClick={() =>
            void act(async () => {
              pauseWantsFocus.current = document.activeElement === pauseRef.current;
              if (paused) await bridge.api.resumeRun();
              else await bridge.api.pauseRun();
              setPaused(!paused);
            })
          }
          data-testid={paused ? 'resume-run' : 'pause-run'}
        >
          {paused ? 'Resume' : 'Pause'}
        </button>
        <ConfirmAction
          label={props.kind === 'drift' ? 'Stop the log' : 'Abort'}
          className="danger"
          disabled={!mine || pending}
          question={
            props.kind === 'drift'
              ? `Stop the drift log now? The readings so far are kept as a finished log; ${safeStateWords(plan)}.`
              : `Abort this ${props.kind === 'sweep' ? 'sweep' : 'run'}? The points so far are kept (marked aborted); ${safeStateWords(plan)}.`
          }
          confirmLabel={props.kind === 'drift' ? 'Stop and keep the log' : 'Abort now'}
          onConfirm={() => void act(() => bridge.api.stopRun())}
          testId="stop-run"
        />
      </div>
      {!connected ? <p className="muted">Connect a bench first (the Bench screen has a one-click simulator).</p> : null}
      {active && !mine ? <p className="muted">A {activeKind} run is in progress; it has to finish first.</p> : null}
      {error ? (
        <p className="error-line" role="alert" data-testid="run-error">
          {error}
        </p>
      ) : null}
      <ProgressLine kind={props.kind} />
    </div>
  );
}

function ProgressLine({ kind }: { kind: RunKind }) {
  const { stores } = useApp();
  const progressKind = useStore(stores.liveRun, (s) => s.progress?.kind ?? null);
  const done = useStore(stores.liveRun, (s) => s.progress?.pointsDone ?? 0);
  const total = useStore(stores.liveRun, (s) => s.progress?.pointsTotal ?? 0);
  const measuredEta = useStore(stores.liveRun, (s) => s.progress?.etaS ?? null);
  const plan = useStore(stores.liveRun, (s) => s.meta?.plan);
  const runId = useStore(stores.liveRun, (s) => s.meta?.id ?? null);
  const tauS = useStore(stores.liveRun, (s) => {
    const probe = s.events.find((e) => e.type === 'settle-probe' && typeof e.tauS === 'number');
    return probe ? (probe.tauS as number) : null;
  });
  const runClockS = useStore(stores.liveRun, (s) => (s.rows > 0 ? (s.columns.time_s?.view()[s.rows - 1] ?? 0) : 0));
  const shownEta = useRef<{ runId: string | null; shown: ShownEta | null }>({ runId: null, shown: null });
  const phase = useStore(stores.liveRun, (s) => s.progress?.phase ?? null);
  const paused = useStore(stores.liveRun, (s) => s.paused);
  const pausedAt = useStore(stores.connection, (s) => s.status?.paused ?? null);
  const status = useStore(stores.liveRun, (s) => (s.meta?.kind === kind ? s.meta.status : null));
  if (shownEta.current.runId !== runId) shownEta.current = { runId, shown: null };
  // Steady: from the plan and the learned settle time at first, main's measured pace later, counting down in between.
  shownEta.current.shown = nextShownEta(shownEta.current.shown, {
    total,
    done,
    measuredEtaS: measuredEta,
    plan,
    tauS,
    runClockS,
  });
  const eta = shownEta.current.shown?.etaS ?? null;
  if (progressKind !== kind && status === null) return null;
  const fraction = total > 0 ? Math.min(1, done / total) : 0;
  return (
    <div
      className={paused ? 'progress progress-paused' : 'progress'}
      data-testid="progress"
      data-paused={paused ? 'yes' : 'no'}
      data-done={done}
      data-total={total}
      data-status={status ?? ''}
    >
      <progress
        max={total > 0 ? total : 1}
        value={status === 'complete' ? (total > 0 ? total : 1) : total > 0 ? done : 0}
        aria-label="Run progress"
      />
      <span>
        {paused && (status === 'running' || status === null)
          ? `Paused${pausedAt ? ` since ${clockTime(pausedAt.since)}, control held at ${supplyVolts(pausedAt.controlV)}` : ''} · ${done} of ${total} ${kind === 'drift' ? 'readings' : 'points'} · output stays as it is; the run stops safely if the pause outlasts its limit`
          : status === 'running' || status === null
            ? `${done} of ${total} ${kind === 'drift' ? 'readings' : 'points'} · ${phase ? PHASE_TEXT[phase] : ''} · about ${duration(eta)} left`
            : `${status === 'complete' ? 'Finished' : status === 'aborted' ? 'Aborted' : 'Interrupted'} after ${done} ${kind === 'drift' ? 'readings' : 'points'}${status === 'complete' ? '' : ` of ${total} (${Math.round(fraction * 100)} %)`}`}
      </span>
    </div>
  );
}
