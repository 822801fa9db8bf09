/** Gain sweep: plan, safety notes, start/pause/abort, live plot, and the analysis afterwards. */
import { useStore } from '../../state/use-store.ts';
import { checkSweepDraft, sweepPointCount } from '../../state/plan-drafts.ts';
import { useApp } from '../app-context.ts';
import { Choice, Field, Panel } from '../controls/Field.tsx';
import { DutIdField, planFieldRenderer, useDutId } from '../controls/plan-fields.tsx';
import { RunControls } from '../controls/RunControls.tsx';
import { SafetyNotes } from '../controls/SafetyNotes.tsx';
import { SweepFigures } from './SweepFigures.tsx';
import { useLiveRunSource } from '../live-run-source.ts';
import { formatFigure } from '../../analysis/format-figure.ts';

function PlanEditor() {
  const { bridge, stores } = useApp();
  const draft = useStore(stores.settings, (s) => s.sweepDraft);
  const limits = useStore(stores.settings, (s) => s.limits);
  const edit = useStore(stores.settings, (s) => s.editSweep);
  const dut = useDutId('clkmul-vco-01');
  const checked = checkSweepDraft(draft, limits);
  const errors = checked.errors;
  const text = planFieldRenderer(draft, errors, edit);
  const { dutId, dutError } = dut;
  const start = checked.ok && !dutError ? () => bridge.api.startSweep(checked.plan, dutId.trim()) : null;
  return (
    <Panel title="Sweep plan" className="plan" testId="sweep-plan">
      <DutIdField dut={dut} testId="dut-id" />
      <div className="row">
        {text('start', 'From', 'V', 'plan-start')}
        {text('stop', 'To', 'V', 'plan-stop')}
        {text('step', 'Step', 'V', 'plan-step')}
      </div>
      <div className="row">
        <Choice
          label="Direction"
          value={draft.direction}
          options={[
            { value: 'up', label: 'Rising' },
            { value: 'down', label: 'Falling' },
            { value: 'up-down', label: 'Rising, then falling' },
          ]}
          onChange={(direction) => edit({ direction })}
          testId="plan-direction"
        />
        {text('readingsPerPoint', 'Readings per point', '', 'plan-readings')}
      </div>
      <div className="row">
        {text('gateS', 'Counter gate', 's', 'plan-gate')}
        {text('refineEdgeV', 'Edge resolution', 'V', 'plan-refine', '0 = no edge search')}
      </div>
      <div className="row">
        <Choice
          label="Settling"
          value={draft.settleMode}
          options={[
            { value: 'auto', label: 'Until steady' },
            { value: 'fixed', label: 'Fixed time' },
          ]}
          onChange={(settleMode) => edit({ settleMode })}
          testId="plan-settle-mode"
        />
        <Field
          label={draft.settleMode === 'auto' ? 'Longest wait' : 'Wait'}
          unit="s"
          value={draft.settleS}
          onChange={(settleS) => edit({ settleS })}
          error={errors['settle.maxS'] ?? errors['settle.seconds']}
          testId="plan-settle"
        />
      </div>
      {errors['limits.maxControlV'] || errors['limits.currentLimitA'] ? (
        <p className="error-line" role="alert">
          The safety limits on the Bench screen need fixing:{' '}
          {errors['limits.maxControlV'] ?? errors['limits.currentLimitA']}
        </p>
      ) : null}
      <p className="muted" data-testid="plan-summary">
        {checked.ok
          ? `${sweepPointCount(checked.plan)} points per pass · limit ${formatFigure(checked.plan.limits.maxControlV, 'V', { digits: 4 })}, ${formatFigure(checked.plan.limits.currentLimitA, 'A', { digits: 3 })}`
          : 'Fix the marked fields to start.'}
      </p>
      <SafetyNotes />
      <RunControls kind="sweep" startLabel="Start sweep" startTestId="start-sweep" start={start} />
    </Panel>
  );
}

export function SweepScreen() {
  const source = useLiveRunSource('sweep');
  return (
    <div className="screen screen-sweep">
      <PlanEditor />
      <div className="results">
        {source ? (
          <SweepFigures source={source} />
        ) : (
          <div className="placeholder" data-testid="sweep-placeholder">
            <h2>No sweep yet</h2>
            <p>
              Start a sweep and the frequency plot fills in as readings arrive; the gain analysis follows when it ends.
            </p>
          </div>
        )}
      </div>
    </div>
  );
}
