/**
 * Bring-up by hand: set the control voltage and switch the output while no
 * run holds the bench. Main checks the same limits a run keeps, applies the
 * current limit and protection first and reads the supply back; closing the
 * bench leaves it in the safe state.
 */
import { useState } from 'react';
import { errorText } from '../../bridge/bench-call-error.ts';
import { parseSiNumber } from '../../contract/si.ts';
import { useStore } from '../../state/use-store.ts';
import { useApp } from '../app-context.ts';
import { Field, Panel } from '../controls/Field.tsx';

export function ManualControl() {
  const { bridge, stores } = useApp();
  const connected = useStore(stores.connection, (s) => s.connection.connected);
  const running = useStore(stores.liveRun, (s) => s.active);
  const output = useStore(stores.connection, (s) => s.status?.output ?? null);
  const setStatus = useStore(stores.connection, (s) => s.setStatus);
  const limits = useStore(stores.settings, (s) => s.limits);
  const [level, setLevel] = useState('0');
  const [pending, setPending] = useState(false);
  const [error, setError] = useState<string | null>(null);
  const controlV = parseSiNumber(level);
  const maxV = parseSiNumber(limits.maxControlV);
  const currentA = parseSiNumber(limits.currentLimitA);
  const levelError =
    controlV === null
      ? 'a voltage, e.g. 1.25 or 750m'
      : maxV !== null && controlV > maxV
        ? `above the highest control voltage (${limits.maxControlV} V)`
        : controlV < 0
          ? 'must be 0 V or more'
          : undefined;
  const blocked = !connected
    ? 'Connect a bench first.'
    : running
      ? 'A run holds the bench; its own plan drives the supply until it ends.'
      : null;

  const send = async (on: boolean) => {
    if (controlV === null || maxV === null || currentA === null) return;
    setPending(true);
    setError(null);
    try {
      setStatus(
        await bridge.api.manualControl({
          controlV,
          output: on,
          limits: { maxControlV: maxV, currentLimitA: currentA },
        }),
      );
    } catch (e) {
      setError(errorText(e));
    } finally {
      setPending(false);
    }
  };

  return (
    <Panel title="Bring-up by hand" className="bring-up" testId="manual-control">
      <p className="muted">
        Sets the control channel outside any run, within the safety limits beside this panel. Disconnecting returns it
        to 0 V with the output off.
      </p>
      {blocked ? (
        <p className="busy-reason" data-testid="manual-blocked">
          {blocked}
        </p>
      ) : null}
      <div className="row">
        <Field
          label="Control voltage"
          unit="V"
          value={level}
          onChange={setLevel}
          error={levelError}
          disabled={blocked !== null || pending}
          testId="manual-level"
        />
      </div>
      <div className="actions">
        <button
          type="button"
          className="primary"
          disabled={blocked !== null || pending || levelError !== undefined || maxV === null || currentA === null}
          onClick={() => void send(true)}
          data-testid="manual-on"
        >
          {output ? 'Apply this voltage' : 'Output on at this voltage'}
        </button>
        <button
          type="button"
          disabled={blocked !== null || pending || levelError !== undefined}
          onClick={() => void send(false)}
          data-testid="manual-off"
        >
          Output off
        </button>
      </div>
      {error ? (
        <p className="error-line" role="alert" data-testid="manual-error">
          {error}
        </p>
      ) : null}
    </Panel>
  );
}
