/**
 * The bench status strip under the top bar, on every screen: the run in
 * progress, where the control voltage is, whether the supply output is on,
 * the latest frequency and temperature, each instrument's link, and how the
 * last run left the supply. All of it from main's bench status, which during
 * a run is built from the run's own readings.
 */
import type { BenchStatus, RunKind } from '../contract/bench-api.ts';
import { useStore } from '../state/use-store.ts';
import { useApp } from './app-context.ts';
import { clockTime, linkText, runKindLabel, stripRunText } from './status-text.ts';
import { planHints } from '../analysis/datasheet-run.ts';
import { celsius, hzAtResolution, supplyVolts } from './units.ts';

function OutputCell({ output }: { output: boolean | null }) {
  const text = output === null ? 'Output unknown' : output ? 'Output on' : 'Output off';
  return (
    <span
      className={`strip-cell strip-output output-${output === null ? 'unknown' : output ? 'on' : 'off'}`}
      data-testid="strip-output"
      data-output={output === null ? 'unknown' : output ? 'on' : 'off'}
    >
      {text}
    </span>
  );
}

function LinksCell({ status }: { status: BenchStatus }) {
  const { stores } = useApp();
  const reconnect = useStore(stores.connection, (s) => s.reconnect);
  const busy = useStore(stores.connection, (s) => s.busy);
  const running = useStore(stores.liveRun, (s) => s.active);
  const roles = useStore(stores.connection, (s) => s.connection.roles);
  const lost = status.links.filter((link) => link.state === 'lost');
  return (
    <span className="strip-cell strip-links" data-testid="strip-links">
      {status.links.map((link) => {
        // A lost link names where the instrument was reached, so the user knows which cable or socket to check.
        const address = roles.find((r) => r.role === link.role)?.address ?? null;
        return (
          <span
            key={link.role}
            className={`link-dot link-${link.state}`}
            data-testid={`strip-link-${link.role}`}
            data-state={link.state}
            title={link.detail ?? `${link.role}: answering`}
          >
            {linkText(link.role, link.state, address)}
          </span>
        );
      })}
      {lost.length > 0 && !running ? (
        <button
          type="button"
          className="quiet strip-button"
          onClick={() => void reconnect()}
          disabled={busy}
          data-testid="strip-reconnect"
          aria-label={`Reconnect the bench (${lost.map((link) => link.role).join(', ')} lost)`}
        >
          Reconnect
        </button>
      ) : null}
    </span>
  );
}

function SafeCell({ status }: { status: BenchStatus }) {
  const safe = status.safeState;
  if (!safe || status.source === 'run') return null;
  return safe.reached ? (
    <span className="strip-cell strip-safe safe-ok" data-testid="strip-safe" data-reached="yes">
      Safe state reached {clockTime(safe.at)}
      {safe.outputOff ? ' · output off' : ' · output left on by the plan'}
    </span>
  ) : (
    <span
      className="strip-cell strip-safe safe-failed"
      data-testid="strip-safe"
      data-reached="no"
      role="alert"
      title={safe.failures.join('\n')}
    >
      Safe state NOT confirmed ({clockTime(safe.at)}): {safe.failures[0] ?? 'no record'} — check the supply by hand
    </span>
  );
}

export function StatusStrip() {
  const { stores } = useApp();
  const status = useStore(stores.connection, (s) => s.status);
  const connected = useStore(stores.connection, (s) => s.connection.connected);
  const active = useStore(stores.liveRun, (s) => s.active);
  const kind = useStore(stores.liveRun, (s): RunKind | null => s.meta?.kind ?? null);
  const dut = useStore(stores.liveRun, (s) => s.meta?.dut.id ?? '');
  // Elapsed on the run's own clock: its latest reading's time since start.
  const elapsedS = useStore(stores.liveRun, (s) =>
    s.rows > 0 ? (s.columns.time_s?.view()[s.rows - 1] ?? null) : null,
  );
  const done = useStore(stores.liveRun, (s) => s.progress?.pointsDone ?? 0);
  const total = useStore(stores.liveRun, (s) => s.progress?.pointsTotal ?? 0);
  // The counter's resolution (1/gate) sets the digits of the frequency while the run's gate is known.
  const gateS = useStore(stores.liveRun, (s) => (s.active && s.meta ? (planHints(s.meta.plan).gateS ?? null) : null));
  if (!connected || !status) {
    return (
      <div className="status-strip strip-idle" role="status" data-testid="status-strip" data-source="none">
        <span className="strip-cell">No bench connected: nothing is driven.</span>
        {status ? <SafeCell status={status} /> : null}
      </div>
    );
  }
  const runText = active && kind ? stripRunText({ kind, dut, done, total, elapsedS }) : 'No run in progress';
  return (
    <div
      className={`status-strip${active ? ' strip-running' : ''}`}
      role="status"
      aria-label="Bench status"
      data-testid="status-strip"
      data-source={status.source}
    >
      <span
        className="strip-cell strip-run"
        data-testid="strip-run"
        title={active && kind ? runKindLabel(kind) : undefined}
      >
        {runText}
      </span>
      {status.paused ? (
        <span className="strip-cell strip-paused" data-testid="strip-paused">
          Paused since {clockTime(status.paused.since)} · control held at {supplyVolts(status.paused.controlV)}
        </span>
      ) : null}
      <OutputCell output={status.output} />
      <span className="strip-cell" data-testid="strip-control">
        Control {supplyVolts(status.controlSetV)} set
        {status.controlMeasV !== null ? ` · ${supplyVolts(status.controlMeasV)} measured` : ''}
      </span>
      <span className="strip-cell" data-testid="strip-frequency">
        {hzAtResolution(status.frequencyHz, status.source === 'run' && gateS ? 1 / gateS : null)}
      </span>
      <span className="strip-cell" data-testid="strip-temperature">
        {celsius(status.temperatureC)}
      </span>
      <LinksCell status={status} />
      <SafeCell status={status} />
    </div>
  );
}
