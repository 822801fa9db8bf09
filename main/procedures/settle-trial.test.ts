/**
 * Where an automatic-settling sweep learns τ: from the step after its first
 * oscillating point when that step is large enough to show the lag (no
 * probe), else from one larger probe step, after which that point is
 * measured again and only its new rows are kept — unless, judged with the
 * learned τ, its readings were settled already. Relaxation DUT with its
 * tuning port slowed to τ = 50 ms on the simulated bench, virtual clock; the
 * reference for "settled" is the same sweep with a fixed 0.5 s settle (10 τ,
 * common practice).
 */
import { describe, expect, it } from 'vitest';
import { expectCurveWithin, expectTauLearnedAt, slowPortSweep } from './testing/slow-port-sweep.ts';

function sweep(
  stepV: number,
  gateS: number,
  settle: { mode: 'auto'; maxS: number; toleranceCounts?: number } | { mode: 'fixed'; seconds: number },
) {
  return slowPortSweep({ start: 1.6, stop: 3.6, step: stepV, gateS, settle }, 3);
}

describe('learning τ in an automatic-settling sweep', () => {
  it('learns τ from a step of many counts between two oscillating points: no probe, every row kept once', async () => {
    // 200 mV ≈ 2 kHz ≈ 200 counts at a 100 ms gate.
    const auto = await sweep(0.2, 0.1, { mode: 'auto', maxS: 2 });
    const fixed = await sweep(0.2, 0.1, { mode: 'fixed', seconds: 0.5 });
    expect(auto.sink.eventsOfType('settle-probe')).toHaveLength(0);
    expect(auto.sink.eventsOfType('remeasure')).toHaveLength(0);
    expectTauLearnedAt(auto.sink, 1);
    for (const p of auto.points.values()) expect(p.statuses).toHaveLength(3);
    // Within 2 counts (20 Hz) of the fixed-settle curve at every point.
    expectCurveWithin(auto.points, fixed.points, 20);
  });

  it('probes when the steps are too small to show τ, then measures that point again and keeps only its new rows', async () => {
    // 50 mV ≈ 450 Hz ≈ 4.5 counts at a 10 ms gate: under the 10 counts a fit needs.
    const auto = await sweep(0.05, 0.01, { mode: 'auto', maxS: 2 });
    const fixed = await sweep(0.05, 0.01, { mode: 'fixed', seconds: 0.5 });
    expect(auto.sink.eventsOfType('settle-probe')).toHaveLength(1);
    // (Points read "no signal" right after switch-on are measured again for their own reason.)
    const again = auto.sink
      .eventsOfType('remeasure')
      .filter((e) => e.reason === 'read before τ was known; its step was too small to show it');
    expect(again).toHaveLength(1);
    // Measured again right after the probe: the event follows it.
    const probeAt = auto.sink.events.findIndex((e) => e.type === 'settle-probe');
    expect(auto.sink.events[probeAt + 1]).toMatchObject({ type: 'remeasure', point_index: again[0]?.point_index });
    for (const p of auto.points.values()) expect(p.statuses).toHaveLength(3);
    expectCurveWithin(auto.points, fixed.points, 200);
  });

  it('keeps the trial point’s readings when, judged with the τ the probe learned, their mean was settled already', async () => {
    // 50 mV ≈ 450 Hz ≈ 45 counts at a 100 ms gate, but a gate of 2τ sees the approach in two readings, the second
    // already under the fit's 10 counts: the probe teaches τ. The trial's own readings, taken a few gates after its
    // step, sit within 1 count by then: no step back to measure them again.
    const auto = await sweep(0.05, 0.1, { mode: 'auto', maxS: 2, toleranceCounts: 1 });
    const fixed = await sweep(0.05, 0.1, { mode: 'fixed', seconds: 0.5 });
    expect(auto.sink.eventsOfType('settle-probe')).toHaveLength(1);
    const stands = auto.sink.eventsOfType('trial-stands');
    expect(stands).toHaveLength(1);
    expect(stands[0]?.meanErrorHz as number).toBeLessThanOrEqual(10);
    expect(auto.sink.eventsOfType('remeasure').filter((e) => e.point_index === stands[0]?.point_index)).toHaveLength(0);
    for (const p of auto.points.values()) expect(p.statuses).toHaveLength(3);
    // Every point, the trial's included, within 2 counts (20 Hz) of the fixed-settle curve.
    expectCurveWithin(auto.points, fixed.points, 20);
  });
});
