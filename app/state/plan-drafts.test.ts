import { describe, expect, it } from 'vitest';
import {
  checkDriftDraft,
  checkSweepDraft,
  DEFAULT_DRIFT,
  DEFAULT_LIMITS,
  DEFAULT_SWEEP,
  sweepPointCount,
} from './plan-drafts.ts';

describe('plan drafts', () => {
  it('accepts the default sweep with SI-prefixed text and counts its points', () => {
    const checked = checkSweepDraft(DEFAULT_SWEEP, DEFAULT_LIMITS);
    expect(checked.ok).toBe(true);
    if (!checked.ok) return;
    expect(checked.plan.refineEdgeV).toBeCloseTo(0.005, 12);
    expect(checked.plan.limits.currentLimitA).toBeCloseTo(0.02, 12);
    expect(sweepPointCount(checked.plan)).toBe(47); // 0.2 … 4.8 V in 0.1 V steps
  });

  it('names the field while typing: a bad number, a missing stop, a zero step', () => {
    expect(checkSweepDraft({ ...DEFAULT_SWEEP, start: '0.2x' }, DEFAULT_LIMITS).errors.start).toMatch(
      /expected a voltage/,
    );
    expect(checkSweepDraft({ ...DEFAULT_SWEEP, stop: '' }, DEFAULT_LIMITS).errors.stop).toMatch(/required/);
    expect(checkSweepDraft({ ...DEFAULT_SWEEP, step: '0' }, DEFAULT_LIMITS).errors.step).toMatch(/greater than 0/);
    expect(
      checkSweepDraft(DEFAULT_SWEEP, { ...DEFAULT_LIMITS, currentLimitA: '' }).errors['limits.currentLimitA'],
    ).toBeDefined();
  });

  it('refuses setpoints above the control-voltage limit and a reversed range', () => {
    expect(checkSweepDraft({ ...DEFAULT_SWEEP, stop: '6' }, DEFAULT_LIMITS).errors.stop).toMatch(/limit of 5 V/);
    expect(checkSweepDraft({ ...DEFAULT_SWEEP, start: '3', stop: '2' }, DEFAULT_LIMITS).errors.stop).toBe(
      'must be above start',
    );
    expect(checkDriftDraft({ ...DEFAULT_DRIFT, controlV: '7.5' }, DEFAULT_LIMITS).errors.controlV).toMatch(/limit/);
  });

  it('parses drift durations such as 15min', () => {
    const checked = checkDriftDraft(DEFAULT_DRIFT, DEFAULT_LIMITS);
    expect(checked.ok && checked.plan.durationS).toBe(900);
  });

  it('the gate field speaks the file grammar: a bare "m" on a time is refused offering both readings', () => {
    const gate = checkSweepDraft({ ...DEFAULT_SWEEP, gateS: '100m' }, DEFAULT_LIMITS);
    expect(gate.ok).toBe(false);
    expect(gate.errors.gateS).toMatch(/ambiguous.*"100ms" \(0\.1 s\).*"100min" \(6000 s\)/);
    const ms = checkSweepDraft({ ...DEFAULT_SWEEP, gateS: '100ms' }, DEFAULT_LIMITS);
    expect(ms.ok && ms.plan.gateS).toBeCloseTo(0.1, 15);
  });
});
