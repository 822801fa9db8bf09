/** Bench: connect the instruments (or the simulator), watch live readings, set the safety limits. */
import { useState } from 'react';
import { useStore } from '../../state/use-store.ts';
import { useApp } from '../app-context.ts';
import { Field, Figure, Panel } from '../controls/Field.tsx';
import { SafetyNotes } from '../controls/SafetyNotes.tsx';
import { ConfirmAction } from '../controls/ConfirmAction.tsx';
import { safeStateWords } from '../status-text.ts';
import { planHints } from '../../analysis/datasheet-run.ts';
import { celsius, hzAtResolution, supplyVolts } from '../units.ts';
import { ManualControl } from './ManualControl.tsx';
import { RoleCard } from './RoleCard.tsx';
import { BrowserSerialButton } from './BrowserSerialButton.tsx';
import { buildBenchConfig, DEFAULT_ROLE_DRAFTS, type RoleDraft, type RoleErrors, type RoleName } from './role-draft.ts';
import { checkSweepDraft } from '../../state/plan-drafts.ts';

const ROLES: readonly RoleName[] = ['supply', 'counter', 'thermometer'];

function LiveReadouts() {
  const { stores } = useApp();
  const status = useStore(stores.connection, (s) => s.status);
  const running = status?.source === 'run';
  const output = status?.output ?? null;
  const gateS = useStore(stores.liveRun, (s) => (s.active && s.meta ? (planHints(s.meta.plan).gateS ?? null) : null));
  return (
    <Panel title="Live readings" testId="live-readouts">
      <p className="muted" data-testid="readout-source">
        {running
          ? 'From the run in progress (its own readings; nothing else queries the instruments).'
          : status?.source === 'idle'
            ? 'Polled a few times a second while no run holds the bench.'
            : 'No bench connected.'}
      </p>
      <dl className="figures figures-wide" aria-live="polite">
        <Figure label="Control, set" value={supplyVolts(status?.controlSetV)} testId="readout-control-set" />
        <Figure label="Control, measured" value={supplyVolts(status?.controlMeasV)} testId="readout-control-meas" />
        <Figure label="Supply output" value={output === null ? '—' : output ? 'on' : 'off'} testId="readout-output" />
        <Figure
          label="Frequency"
          value={hzAtResolution(status?.frequencyHz, running && gateS ? 1 / gateS : null)}
          testId="readout-frequency"
        />
        <Figure label="Temperature" value={celsius(status?.temperatureC)} testId="readout-temperature" />
      </dl>
    </Panel>
  );
}

function LimitsPanel() {
  const { stores } = useApp();
  const limits = useStore(stores.settings, (s) => s.limits);
  const sweepDraft = useStore(stores.settings, (s) => s.sweepDraft);
  const edit = useStore(stores.settings, (s) => s.editLimits);
  const running = useStore(stores.liveRun, (s) => s.active);
  const errors = checkSweepDraft(sweepDraft, limits).errors;
  return (
    <Panel title="Safety limits" testId="limits">
      <p className="muted">
        Applied to every sweep, drift log and bring-up setting; the bench process checks them again before each write to
        the supply.
      </p>
      {running ? (
        <p className="busy-reason">Locked while a run is in progress: the run keeps the limits it started with.</p>
      ) : null}
      <div className="row">
        <Field
          label="Highest control voltage"
          unit="V"
          value={limits.maxControlV}
          onChange={(maxControlV) => edit({ maxControlV })}
          error={errors['limits.maxControlV']}
          disabled={running}
          testId="limit-max-control"
        />
        <Field
          label="Current limit, control port"
          unit="A"
          value={limits.currentLimitA}
          onChange={(currentLimitA) => edit({ currentLimitA })}
          error={errors['limits.currentLimitA']}
          hint="SI prefixes welcome: 20m = 20 mA"
          disabled={running}
          testId="limit-current"
        />
      </div>
      <SafetyNotes />
    </Panel>
  );
}

export function BenchScreen() {
  const { stores } = useApp();
  const connected = useStore(stores.connection, (s) => s.connection.connected);
  const simulated = useStore(stores.connection, (s) => s.connection.simulated);
  const roles = useStore(stores.connection, (s) => s.connection.roles);
  const ports = useStore(stores.connection, (s) => s.ports);
  const profiles = useStore(stores.connection, (s) => s.profiles);
  const busy = useStore(stores.connection, (s) => s.busy);
  const error = useStore(stores.connection, (s) => s.error);
  const connect = useStore(stores.connection, (s) => s.connect);
  const disconnect = useStore(stores.connection, (s) => s.disconnect);
  const refresh = useStore(stores.connection, (s) => s.refresh);
  const show = useStore(stores.settings, (s) => s.show);
  const running = useStore(stores.liveRun, (s) => s.active);
  const runKind = useStore(stores.liveRun, (s) => s.meta?.kind ?? null);
  const runPlan = useStore(stores.liveRun, (s) => s.meta?.plan);
  const locked = busy || running;
  // Joined to a string: a store selector must return a stable value.
  const lostRoles = useStore(stores.connection, (s) =>
    (s.status?.links ?? [])
      .filter((link) => link.state === 'lost')
      .map((link) => link.role)
      .join(' '),
  );
  const [drafts, setDrafts] = useState<Record<RoleName, RoleDraft>>(DEFAULT_ROLE_DRAFTS);
  const [errors, setErrors] = useState<RoleErrors>({});

  const useSimulator = async () => {
    if (await connect('sim')) show('sweep');
  };
  const connectInstruments = async () => {
    const built = buildBenchConfig(drafts);
    setErrors(built.errors);
    if (built.config) await connect(built.config);
  };

  return (
    <div className="screen screen-bench">
      <section className="hero" aria-label="Quick start">
        <div>
          <h1>Set up the bench</h1>
          <p>
            No instruments at hand? The simulated bench drives a model oscillator through the same commands, so you can
            run a gain sweep right away.
          </p>
        </div>
        <div className="hero-actions">
          <button
            type="button"
            className="primary big"
            onClick={() => void useSimulator()}
            disabled={locked}
            data-testid="use-sim"
          >
            Use the simulated bench
          </button>
          <BrowserSerialButton disabled={locked} />
          {connected ? (
            <ConfirmAction
              label="Disconnect"
              question={
                running
                  ? `Disconnect now? This ends the ${runKind ?? 'run'} in progress: ${safeStateWords(runPlan)}; then the links close. Readings so far stay in the run archive.`
                  : null
              }
              confirmLabel="End the run and disconnect"
              onConfirm={() => void disconnect()}
              disabled={busy}
              testId="disconnect-bench"
            />
          ) : null}
        </div>
      </section>
      {running ? (
        <p className="busy-reason" data-testid="bench-locked">
          A {runKind ?? ''} run is in progress: changing instruments or limits now would disturb it, so they are locked
          until it ends.
        </p>
      ) : null}
      {simulated && connected ? (
        <p className="sim-ribbon" data-testid="sim-ribbon">
          Simulated bench in use: readings come from a model, not from hardware.
        </p>
      ) : null}
      {error ? (
        <p className="error-line" role="alert" data-testid="bench-error">
          {error}
        </p>
      ) : null}
      <Panel
        title="Instruments"
        testId="instruments"
        actions={
          <button
            type="button"
            className="quiet"
            onClick={() => void refresh()}
            disabled={locked}
            data-testid="refresh-ports"
          >
            Look for ports again
          </button>
        }
      >
        <div className="role-grid">
          {ROLES.map((role) => (
            <RoleCard
              key={role}
              role={role}
              draft={drafts[role]}
              errors={errors}
              ports={ports}
              profiles={profiles}
              identity={roles.find((r) => r.role === role)?.idn ?? null}
              linkLost={lostRoles.split(' ').includes(role)}
              disabled={locked}
              onChange={(patch) => setDrafts((all) => ({ ...all, [role]: { ...all[role], ...patch } }))}
            />
          ))}
        </div>
        <div className="actions">
          <button
            type="button"
            className="primary"
            onClick={() => void connectInstruments()}
            disabled={locked}
            data-testid="connect-bench"
          >
            Connect these instruments
          </button>
        </div>
        {roles.length > 0 ? (
          <table className="table identities" data-testid="identities">
            <caption>Connected</caption>
            <thead>
              <tr>
                <th scope="col">Role</th>
                <th scope="col">Address</th>
                <th scope="col">Identity</th>
              </tr>
            </thead>
            <tbody>
              {roles.map((r) => (
                <tr key={r.role}>
                  <td>{r.role}</td>
                  <td>
                    <code>{r.address}</code>
                  </td>
                  <td>
                    <code>{r.idn}</code>
                    {r.simulated ? <span className="tag">sim</span> : null}
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        ) : null}
      </Panel>
      <div className="two-col">
        <LiveReadouts />
        <LimitsPanel />
      </div>
      <ManualControl />
    </div>
  );
}
