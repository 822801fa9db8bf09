/** Drift log: plan, cautions, start/stop, live frequency and temperature, analysis at the end. */
import { useStore } from '../../state/use-store.ts';
import { checkDriftDraft } from '../../state/plan-drafts.ts';
import { useApp } from '../app-context.ts';
import { Panel } from '../controls/Field.tsx';
import { DutIdField, planFieldRenderer, useDutId } from '../controls/plan-fields.tsx';
import { RunControls } from '../controls/RunControls.tsx';
import { SafetyNotes } from '../controls/SafetyNotes.tsx';
import { duration } from '../units.ts';
import { DriftFigures } from './DriftFigures.tsx';
import { useLiveRunSource } from '../live-run-source.ts';

function DriftPlan() {
  const { bridge, stores } = useApp();
  const draft = useStore(stores.settings, (s) => s.driftDraft);
  const limits = useStore(stores.settings, (s) => s.limits);
  const edit = useStore(stores.settings, (s) => s.editDrift);
  const dut = useDutId();
  const checked = checkDriftDraft(draft, limits);
  const text = planFieldRenderer(draft, checked.errors, edit);
  const { dutId, dutError } = dut;
  const start = checked.ok && !dutError ? () => bridge.api.startDrift(checked.plan, dutId.trim()) : null;
  return (
    <Panel title="Drift log plan" className="plan" testId="drift-plan">
      <DutIdField dut={dut} testId="drift-dut-id" />
      <div className="row">
        {text('controlV', 'Hold control at', 'V', 'drift-control')}
        {text('intervalS', 'Every', '', 'drift-interval', 'e.g. 1s, 500ms')}
      </div>
      <div className="row">
        {text('durationS', 'For', '', 'drift-duration', 'e.g. 90s, 15min, 8h')}
        {text('gateS', 'Counter gate', 's', 'drift-gate')}
      </div>
      <p className="muted" data-testid="drift-summary">
        {checked.ok
          ? `About ${Math.floor(checked.plan.durationS / checked.plan.intervalS)} readings over ${duration(checked.plan.durationS)}.`
          : 'Fix the marked fields to start.'}
      </p>
      <SafetyNotes />
      <RunControls kind="drift" startLabel="Start drift log" startTestId="start-drift" start={start} />
    </Panel>
  );
}

export function DriftScreen() {
  const source = useLiveRunSource('drift');
  return (
    <div className="screen screen-sweep">
      <DriftPlan />
      <div className="results">
        {source ? (
          <DriftFigures source={source} />
        ) : (
          <div className="placeholder">
            <h2>No drift log yet</h2>
            <p>
              Hold the control voltage and log frequency and temperature over minutes or hours; tempco, drift rate and
              Allan deviation follow when it ends.
            </p>
          </div>
        )}
      </div>
    </div>
  );
}
