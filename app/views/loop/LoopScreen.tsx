/**
 * Loop filter: from a measured sweep's Kvco, a passive charge-pump PLL filter
 * for the entered reference, divider, pump current, bandwidth and phase
 * margin, designed at the lock point N·f_ref on the run's tuning curve; then
 * how crossover and margin move at the Kvco corners of the tuning window. A
 * corner the loop cannot use is listed with its reason, never dropped.
 */
import { useEffect, useMemo, useState } from 'react';
import type uPlot from 'uplot';
import { designLoopFilter, type LoopDesign } from '../../analysis/loop-filter.ts';
import { RoundedComponents } from './RoundedComponents.tsx';
import { loopAcrossKvco, logFrequencies, openLoopResponse } from '../../analysis/loop-filter-eval.ts';
import { loopOperatingPoint, type KvcoCorner } from '../../analysis/loop-operating-point.ts';
import type { SweepAnalysis } from '../../analysis/sweep-types.ts';
import { errorText } from '../../bridge/bench-call-error.ts';
import { PlotPanel } from '../../plots/PlotPanel.tsx';
import { baseOptions, lineSeries, logSiAxis, siAxis, xSeries } from '../../plots/plot-options.ts';
import { useStore } from '../../state/use-store.ts';
import { useApp } from '../app-context.ts';
import { useEffectiveTheme } from '../use-theme.ts';
import { Choice, Field, Figure, Panel } from '../controls/Field.tsx';
import { formatFigure } from '../../analysis/format-figure.ts';
import { hz, si, when } from '../units.ts';
import { analyzeColumns } from '../sweep/sweep-figures.ts';
import { checkLoopDraft, DEFAULT_LOOP, type LoopDraft } from './loop-inputs.ts';

const CORNER_LABELS: Record<KvcoCorner['label'], string> = {
  min: 'Kvco min (window)',
  lock: 'Kvco at the lock point',
  max: 'Kvco max (window)',
};

/** uPlot reads null as a gap; NaN (log of a non-positive gain) would break its ranging. */
function finiteOrNull(values: Float64Array): (number | null)[] {
  return Array.from(values, (v) => (Number.isFinite(v) ? v : null));
}

export function LoopScreen() {
  const { stores } = useApp();
  const theme = useEffectiveTheme();
  const runs = useStore(stores.runs, (s) => s.runs);
  const opened = useStore(stores.runs, (s) => s.opened);
  const open = useStore(stores.runs, (s) => s.open);
  const sweeps = runs.filter((r) => r.kind === 'sweep' && r.status !== 'running');
  const [runId, setRunId] = useState<string>('');
  const [draft, setDraft] = useState<LoopDraft>(DEFAULT_LOOP);
  const chosen = runId || sweeps[0]?.id || '';
  useEffect(() => {
    if (chosen && !opened[chosen]) void open(chosen);
  }, [chosen, opened, open]);

  const run = chosen ? opened[chosen] : undefined;
  const analysis = useMemo((): { sweep: SweepAnalysis } | { error: string } | null => {
    if (!run) return null;
    const plan = run.detail.meta.plan as { gateS?: unknown } | null;
    const outcome = analyzeColumns(run.columns, run.rows, typeof plan?.gateS === 'number' ? plan.gateS : undefined);
    return outcome.ok ? { sweep: outcome.analysis } : { error: outcome.message };
  }, [run]);

  const checked = checkLoopDraft(draft);
  const point = useMemo(() => {
    if (!checked.values || !analysis || !('sweep' in analysis)) return null;
    return loopOperatingPoint(analysis.sweep, checked.values.referenceHz, checked.values.dividerN);
  }, [analysis, checked.values?.referenceHz, checked.values?.dividerN]);
  const design = useMemo(():
    | { design: LoopDesign; checks: (ReturnType<typeof loopAcrossKvco>[number] & { label: string })[] }
    | { error: string }
    | null => {
    if (!checked.values || !point) return null;
    const v = checked.values;
    try {
      const lock = point.corners.find((c) => c.label === 'lock');
      if (!lock || !lock.usable) return { error: lock?.reason ?? 'no lock point on this sweep' };
      const made = designLoopFilter({ ...v, kvcoHzPerV: Math.abs(lock.kvcoHzPerV) });
      // Only corners with loop gain can be checked; the others stay in the table with their reason.
      const usable = point.corners.filter((c) => c.usable);
      const checks = loopAcrossKvco(
        made.filter,
        { dividerN: v.dividerN, chargePumpA: v.chargePumpA },
        usable.map((c) => Math.abs(c.kvcoHzPerV)),
      );
      return {
        design: made,
        checks: checks.map((c, i) => ({ ...c, label: CORNER_LABELS[usable[i]?.label ?? 'lock'] })),
      };
    } catch (error) {
      return { error: errorText(error) };
    }
  }, [
    checked.values?.referenceHz,
    checked.values?.dividerN,
    checked.values?.chargePumpA,
    checked.values?.loopBandwidthHz,
    checked.values?.phaseMarginDeg,
    checked.values?.order,
    point,
  ]);

  const bode = useMemo(() => {
    if (!design || !('design' in design) || !checked.values) return null;
    const bw = checked.values.loopBandwidthHz;
    const freqs = logFrequencies(bw / 100, bw * 100, 300);
    const responses = design.checks.map((c) =>
      openLoopResponse(
        design.design.filter,
        {
          dividerN: checked.values?.dividerN ?? 1,
          chargePumpA: checked.values?.chargePumpA ?? 0,
          kvcoHzPerV: c.kvcoHzPerV,
        },
        freqs,
      ),
    );
    return { freqs, responses };
  }, [design]);

  const edit = (patch: Partial<LoopDraft>) => setDraft((d) => ({ ...d, ...patch }));
  const f = design && 'design' in design ? design.design.filter : null;
  const key = `${chosen}|${theme}|${JSON.stringify(checked.values)}`;
  return (
    <div className="screen screen-sweep">
      <Panel title="Loop to design" className="plan" testId="loop-inputs">
        <Choice
          label="Sweep whose Kvco to use"
          value={chosen}
          options={
            sweeps.length > 0
              ? sweeps.map((r) => ({ value: r.id, label: `${r.dut.id} · ${when(r.startedAt)}` }))
              : [{ value: '', label: 'No finished sweeps yet' }]
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
            error={checked.errors.referenceHz}
            testId="loop-reference"
          />
          <Field
            label="Feedback divider N"
            value={draft.dividerN}
            onChange={(dividerN) => edit({ dividerN })}
            error={checked.errors.dividerN}
            testId="loop-divider"
          />
        </div>
        <div className="row">
          <Field
            label="Charge-pump current"
            unit="A"
            value={draft.chargePumpA}
            onChange={(chargePumpA) => edit({ chargePumpA })}
            error={checked.errors.chargePumpA}
            hint="100u = 100 µA"
            testId="loop-icp"
          />
          <Field
            label="Loop bandwidth"
            unit="Hz"
            value={draft.loopBandwidthHz}
            onChange={(loopBandwidthHz) => edit({ loopBandwidthHz })}
            error={checked.errors.loopBandwidthHz}
            testId="loop-bandwidth"
          />
        </div>
        <div className="row">
          <Field
            label="Phase margin"
            unit="°"
            value={draft.phaseMarginDeg}
            onChange={(phaseMarginDeg) => edit({ phaseMarginDeg })}
            error={checked.errors.phaseMarginDeg}
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
            {point.message ? (
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
        {design && 'error' in design ? (
          <p className="error-line" role="alert">
            {design.error}
          </p>
        ) : null}
        {!run ? <div className="placeholder">Run a sweep first; its measured Kvco sets the filter.</div> : null}
        {f && design && 'design' in design ? (
          <div className="sweep-figures">
            <div className="plots">
              {bode ? (
                <>
                  <PlotPanel
                    testId="loop-magnitude-plot"
                    title="Open-loop gain"
                    buildKey={`${key}|mag`}
                    height={240}
                    data={() =>
                      [
                        Array.from(bode.freqs),
                        ...bode.responses.map((r) => finiteOrNull(r.magnitudeDb)),
                      ] as uPlot.AlignedData
                    }
                    options={(colors, width, height) =>
                      baseOptions(
                        width,
                        height,
                        [
                          xSeries('Hz', 'Frequency'),
                          ...design.checks.map((c, i) =>
                            lineSeries(c.label, colors.series[i] ?? colors.text, '', {
                              value: (_u, v) => (v === null ? '—' : `${v.toFixed(1)} dB`),
                            }),
                          ),
                        ],
                        [
                          logSiAxis(colors, 'Offset frequency', 'Hz'),
                          { ...siAxis(colors, 'Gain', ''), values: (_u, vals) => vals.map((v) => `${v} dB`) },
                        ],
                        { scales: { x: { time: false, distr: 3 } } },
                      )
                    }
                  />
                  <PlotPanel
                    testId="loop-phase-plot"
                    title="Open-loop phase"
                    buildKey={`${key}|phase`}
                    height={220}
                    data={() =>
                      [
                        Array.from(bode.freqs),
                        ...bode.responses.map((r) => finiteOrNull(r.phaseDeg)),
                      ] as uPlot.AlignedData
                    }
                    options={(colors, width, height) =>
                      baseOptions(
                        width,
                        height,
                        [
                          xSeries('Hz', 'Frequency'),
                          ...design.checks.map((c, i) =>
                            lineSeries(c.label, colors.series[i] ?? colors.text, '', {
                              value: (_u, v) => (v === null ? '—' : `${v.toFixed(1)}°`),
                            }),
                          ),
                        ],
                        [
                          logSiAxis(colors, 'Offset frequency', 'Hz'),
                          { ...siAxis(colors, 'Phase', ''), values: (_u, vals) => vals.map((v) => `${v}°`) },
                        ],
                        { scales: { x: { time: false, distr: 3 } } },
                      )
                    }
                  />
                </>
              ) : null}
            </div>
            <section className="key-figures" aria-label="Loop filter" data-testid="loop-components">
              <h2>Components</h2>
              <dl className="figures">
                <Figure label="C1" value={si(f.c1F, 'F')} testId="loop-c1" />
                <Figure label="R2" value={si(f.r2Ohm, 'Ω')} testId="loop-r2" />
                <Figure label="C2" value={si(f.c2F, 'F')} testId="loop-c2" />
                {f.r3Ohm !== null ? <Figure label="R3" value={si(f.r3Ohm, 'Ω')} testId="loop-r3" /> : null}
                {f.c3F !== null ? <Figure label="C3" value={si(f.c3F, 'F')} testId="loop-c3" /> : null}
              </dl>
              <h2>At each Kvco</h2>
              <table className="table" data-testid="loop-checks">
                <thead>
                  <tr>
                    <th scope="col">Kvco</th>
                    <th scope="col">Crossover</th>
                    <th scope="col">Margin</th>
                  </tr>
                </thead>
                <tbody>
                  {design.checks.map((c) => (
                    <tr key={c.label}>
                      <td>{c.label}</td>
                      <td>{hz(c.crossoverHz, 3)}</td>
                      <td>{c.phaseMarginDeg.toFixed(1)}°</td>
                    </tr>
                  ))}
                  {point?.corners
                    .filter((c) => !c.usable)
                    .map((c) => (
                      <tr key={`unusable-${c.label}`} data-testid={`loop-unusable-${c.label}`}>
                        <td>{CORNER_LABELS[c.label]}</td>
                        <td colSpan={2}>not usable: {c.reason}</td>
                      </tr>
                    ))}
                </tbody>
              </table>
              {design.design.warnings.map((w) => (
                <p key={w} className="warnings">
                  {w}
                </p>
              ))}
              <RoundedComponents
                filter={f}
                dividerN={checked.values?.dividerN ?? 1}
                chargePumpA={checked.values?.chargePumpA ?? 0}
                corners={design.checks}
              />
              <p className="muted small">{design.design.source}</p>
            </section>
          </div>
        ) : null}
      </div>
    </div>
  );
}
