/**
 * Loop filter: from a measured sweep's Kvco, a passive charge-pump PLL filter
 * for the entered reference, divider, pump current, bandwidth and phase
 * margin, designed at the lock point N·f_ref on the run's tuning curve (by
 * default the middle of the run's tuning window: `suggestedLoop`); then
 * how crossover and margin move at the Kvco corners of the tuning window. A
 * corner the loop cannot use is listed with its reason, never dropped. An
 * input that cannot be used says why next to its field while the last good
 * design stays in view, marked as such.
 */
import { useEffect, useMemo, useRef, useState } from 'react';
import { logFrequencies, openLoopResponse } from '../../analysis/loop-filter-eval.ts';
import { loopOperatingPoint } from '../../analysis/loop-operating-point.ts';
import type { SweepAnalysis } from '../../analysis/sweep-types.ts';
import { formatFigure } from '../../analysis/format-figure.ts';
import { useStore } from '../../state/use-store.ts';
import { useApp } from '../app-context.ts';
import { useEffectiveTheme } from '../use-theme.ts';
import { Choice, Field, Figure, Panel } from '../controls/Field.tsx';
import { when } from '../units.ts';
import { analyzeColumns } from '../sweep/sweep-figures.ts';
import { checkLoopDraft, DEFAULT_LOOP, suggestedLoop, type LoopDraft, type LoopValues } from './loop-inputs.ts';
import { CORNER_LABELS, designAtLock, frequencyPoints, offeredSweeps, type DesignOutcome } from './loop-design.ts';
import { LoopBode } from './LoopBode.tsx';
import { LoopResults } from './LoopResults.tsx';

type GoodDesign = Extract<DesignOutcome, { ok: true }>;

export function LoopScreen() {
  const { stores } = useApp();
  const theme = useEffectiveTheme();
  const runs = useStore(stores.runs, (s) => s.runs);
  const opened = useStore(stores.runs, (s) => s.opened);
  const open = useStore(stores.runs, (s) => s.open);
  // Sweeps found, once opened, to have no reading with a frequency: not offered.
  const [noPoints, setNoPoints] = useState<ReadonlySet<string>>(new Set());
  const sweeps = offeredSweeps(runs, noPoints);
  const [runId, setRunId] = useState<string>('');
  // What the user typed; the rest of the form is the chosen run's own suggestion (or the example before a run).
  const [edits, setEdits] = useState<Partial<LoopDraft>>({});
  const chosen = sweeps.some((r) => r.id === runId) ? runId : (sweeps[0]?.id ?? '');
  useEffect(() => {
    if (chosen && !opened[chosen]) void open(chosen);
  }, [chosen, opened, open]);

  const run = chosen ? opened[chosen] : undefined;
  useEffect(() => {
    if (!run || !chosen) return;
    const points = frequencyPoints(run.columns.frequency_hz.view(), run.columns.status.view(), run.rows);
    if (points === 0) setNoPoints((known) => new Set([...known, chosen]));
  }, [run, chosen]);
  const analysis = useMemo((): { sweep: SweepAnalysis } | { error: string } | null => {
    if (!run) return null;
    const plan = run.detail.meta.plan as { gateS?: unknown } | null;
    const outcome = analyzeColumns(run.columns, run.rows, typeof plan?.gateS === 'number' ? plan.gateS : undefined);
    return outcome.ok ? { sweep: outcome.analysis } : { error: outcome.message };
  }, [run]);

  // The lock point starts on the chosen run's curve (middle of its tuning window), never the example's 5 MHz.
  const suggested = useMemo(() => (analysis && 'sweep' in analysis ? suggestedLoop(analysis.sweep) : null), [analysis]);
  const draft: LoopDraft = { ...DEFAULT_LOOP, ...(suggested ?? {}), ...edits };
  const checked = checkLoopDraft(draft);
  // While a field cannot be read, the last readable inputs stand (the field says what is wrong).
  const lastValues = useRef<LoopValues | null>(null);
  if (checked.values) lastValues.current = checked.values;
  const typed = checked.values ?? lastValues.current;
  // One object per distinct set of inputs, so the design and the plots are redone only when an input changes.
  const typedKey = JSON.stringify(typed);
  const values = useMemo(() => typed, [typedKey]);
  const point = useMemo(() => {
    if (!values || !analysis || !('sweep' in analysis)) return null;
    return loopOperatingPoint(analysis.sweep, values.referenceHz, values.dividerN);
  }, [analysis, values?.referenceHz, values?.dividerN]);
  const outcome = useMemo(
    (): DesignOutcome | null => (values && point ? designAtLock(point, values) : null),
    [values, point],
  );
  // The last good design on this run stays in view while the inputs cannot make one.
  const lastGood = useRef<{ runId: string; good: GoodDesign; values: LoopValues } | null>(null);
  if (outcome?.ok && values) lastGood.current = { runId: chosen, good: outcome, values };
  const shown = lastGood.current?.runId === chosen ? lastGood.current : null;
  const stale = shown !== null && (!checked.values || !outcome?.ok);
  const designError = outcome && !outcome.ok ? outcome : null;
  const fieldError = (key: keyof LoopDraft): string | undefined =>
    checked.errors[key] ?? (designError?.field === key ? designError.error : undefined);

  const bode = useMemo(() => {
    if (!shown) return null;
    const bw = shown.values.loopBandwidthHz;
    const freqs = logFrequencies(bw / 100, bw * 100, 300);
    const responses = shown.good.checks.map((c) =>
      openLoopResponse(
        shown.good.design.filter,
        { dividerN: shown.values.dividerN, chargePumpA: shown.values.chargePumpA, kvcoHzPerV: c.kvcoHzPerV },
        freqs,
      ),
    );
    return { freqs, responses };
  }, [shown?.good, shown?.values]);

  const edit = (patch: Partial<LoopDraft>) => setEdits((d) => ({ ...d, ...patch }));
  const key = `${chosen}|${theme}|${JSON.stringify(shown?.values ?? null)}`;
  return (
    <div className="screen screen-sweep">
      <Panel title="Loop to design" className="plan" testId="loop-inputs">
        <Choice
          label="Sweep whose Kvco to use"
          value={chosen}
          options={
            sweeps.length > 0
              ? sweeps.map((r) => ({ value: r.id, label: `${r.dut.id} · ${when(r.startedAt)}` }))
              : [{ value: '', label: 'No finished sweep with readings yet' }]
          }
          onChange={setRunId}
          testId="loop-run"
        />
        <div className="row">
          <Field
            label="Reference (comparison) frequency"
            unit="Hz"
            value={draft.referenceHz}
            onChange={(referenceHz) => edit({ referenceHz })}
            error={fieldError('referenceHz')}
            testId="loop-reference"
          />
          <Field
            label="Feedback divider N"
            value={draft.dividerN}
            onChange={(dividerN) => edit({ dividerN })}
            error={fieldError('dividerN')}
            testId="loop-divider"
          />
        </div>
        <div className="row">
          <Field
            label="Charge-pump current"
            unit="A"
            value={draft.chargePumpA}
            onChange={(chargePumpA) => edit({ chargePumpA })}
            error={fieldError('chargePumpA')}
            hint="100u = 100 µA"
            testId="loop-icp"
          />
          <Field
            label="Loop bandwidth"
            unit="Hz"
            value={draft.loopBandwidthHz}
            onChange={(loopBandwidthHz) => edit({ loopBandwidthHz })}
            error={fieldError('loopBandwidthHz')}
            testId="loop-bandwidth"
          />
        </div>
        <div className="row">
          <Field
            label="Phase margin"
            unit="°"
            value={draft.phaseMarginDeg}
            onChange={(phaseMarginDeg) => edit({ phaseMarginDeg })}
            error={fieldError('phaseMarginDeg')}
            testId="loop-margin"
          />
          <Choice
            label="Filter"
            value={draft.order}
            options={[
              { value: '2', label: '2nd order (C1, R2, C2)' },
              { value: '3', label: '3rd order (adds R3, C3)' },
            ]}
            onChange={(order) => edit({ order })}
            testId="loop-order"
          />
        </div>
        {analysis && 'error' in analysis ? <p className="error-line">Sweep analysis: {analysis.error}</p> : null}
        {point ? (
          <>
            {point.message && point.message !== designError?.error ? (
              <p className="warnings" role="alert" data-testid="loop-lock-message">
                {point.message}
              </p>
            ) : null}
            <dl className="figures">
              <Figure
                label="Lock point N·f_ref"
                value={formatFigure(point.targetHz, 'Hz', { digits: 6 })}
                testId="loop-target"
              />
              <Figure
                label="Control voltage there"
                value={
                  point.lockV === null ? '—' : formatFigure(point.lockV, 'V', { uncertainty: point.lockUncertaintyV })
                }
                testId="loop-lock-v"
              />
              {point.corners.map((c, i) => (
                <Figure
                  key={c.label}
                  label={CORNER_LABELS[c.label]}
                  value={
                    Number.isFinite(c.kvcoHzPerV)
                      ? formatFigure(c.kvcoHzPerV, 'Hz/V', { uncertainty: c.uncertaintyHzPerV })
                      : '—'
                  }
                  note={c.reason ?? (Number.isFinite(c.v) ? `at ${formatFigure(c.v, 'V', { digits: 4 })}` : undefined)}
                  testId={`loop-kvco-${i}`}
                />
              ))}
            </dl>
          </>
        ) : null}
      </Panel>
      <div className="results">
        {!run ? <div className="placeholder">Run a sweep first; its measured Kvco sets the filter.</div> : null}
        {stale && shown ? (
          <p className="busy-reason" role="status" data-testid="loop-stale">
            Showing the design for the last inputs that worked (
            {formatFigure(shown.values.loopBandwidthHz, 'Hz', { digits: 3 })} bandwidth,{' '}
            {formatFigure(shown.values.phaseMarginDeg, '', { digits: 3 })}° margin): the field marked in red says what
            to change.
          </p>
        ) : null}
        {designError && !shown ? (
          <p className="error-line" role="alert" data-testid="loop-design-error">
            No design for these inputs: the field marked in red says why.
          </p>
        ) : null}
        {shown ? (
          <div className={stale ? 'sweep-figures loop-stale' : 'sweep-figures'}>
            <div className="plots">
              {bode ? (
                <LoopBode buildKey={key} freqs={bode.freqs} responses={bode.responses} corners={shown.good.checks} />
              ) : null}
            </div>
            <LoopResults
              design={shown.good.design}
              checks={shown.good.checks}
              unusable={point?.corners.filter((c) => !c.usable) ?? []}
              dividerN={shown.values.dividerN}
              chargePumpA={shown.values.chargePumpA}
            />
          </div>
        ) : null}
      </div>
    </div>
  );
}
