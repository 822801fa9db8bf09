import { describe, expect, it } from 'vitest';
import { benchConfigSchema, describeIssues, driftPlanSchema, pushingPlanSchema, sweepPlanSchema } from './plans.ts';
import { nearestKey } from './schema-kit.ts';

const limits = { maxControlV: 5, currentLimitA: 0.02 };

function problems(result: { success: boolean; error?: import('zod').ZodError }): string {
  return result.success || result.error === undefined ? '' : describeIssues(result.error);
}

describe('files refuse unknown keys, naming the nearest known one', () => {
  it('a misspelt bench key is refused with a did-you-mean, at every level', () => {
    const result = benchConfigSchema.safeParse({
      supply: { address: 'sim', controlChanel: 2 },
      counter: { address: 'sim' },
      thermometr: { address: 'sim' },
    });
    const text = problems(result);
    expect(text).toMatch(/^supply: unknown key "controlChanel" \(did you mean "controlChannel"\?\)/m);
    expect(text).toMatch(/^\(root\): unknown key "thermometr" \(did you mean "thermometer"\?\)/m);
  });

  it('a plan key with no near miss is refused and the keys it takes are listed', () => {
    const text = problems(sweepPlanSchema.safeParse({ start: 1, stop: 2, step: 0.1, limits, colour: 'red' }));
    expect(text).toMatch(/\(root\): unknown key "colour"; this object takes: start, stop, step/);
  });

  it('nested plan objects are strict too', () => {
    expect(problems(driftPlanSchema.safeParse({ controlV: 1, limits: { ...limits, maxControlv: 5 } }))).toMatch(
      /limits: unknown key "maxControlv" \(did you mean "maxControlV"\?\)/,
    );
    expect(
      problems(
        sweepPlanSchema.safeParse({ start: 1, stop: 2, step: 0.1, limits, settle: { mode: 'auto', maxSeconds: 3 } }),
      ),
    ).toMatch(/settle: unknown key "maxSeconds"/);
  });

  it('"$schema" is allowed at the top of a file', () => {
    expect(
      pushingPlanSchema.safeParse({
        $schema: '../schemas/pushing-plan.schema.json',
        controlV: 1,
        supplyStartV: 3,
        supplyStopV: 3.6,
        supplyStepV: 0.1,
        maxSupplyV: 3.6,
        limits,
      }).success,
    ).toBe(true);
  });

  it('nearestKey suggests only close names', () => {
    expect(nearestKey('durationS', ['intervalS', 'durationS'])).toBe('durationS');
    expect(nearestKey('gates', ['gateS', 'settle'])).toBe('gateS');
    expect(nearestKey('banana', ['gateS', 'settle'])).toBeNull();
  });
});

describe('plan fields speak the one quantity grammar', () => {
  it('"100m" in a time field is refused, not read as 100 minutes', () => {
    const text = problems(sweepPlanSchema.safeParse({ start: 1, stop: 2, step: 0.1, gateS: '100m', limits }));
    expect(text).toMatch(/gateS: "100m" is ambiguous for a time: write "100ms" \(0\.1 s\) or "100min" \(6000 s\)/);
  });

  it("volts and amps keep their prefixes and refuse another quantity's unit", () => {
    const plan = sweepPlanSchema.parse({
      start: '500m',
      stop: '4.5V',
      step: '50mV',
      gateS: '100ms',
      limits: { maxControlV: 5, currentLimitA: '20mA' },
    });
    expect(plan.start).toBe(0.5);
    expect(plan.stop).toBe(4.5);
    expect(plan.gateS).toBeCloseTo(0.1, 15);
    expect(plan.limits.currentLimitA).toBeCloseTo(0.02, 15);
    expect(problems(sweepPlanSchema.safeParse({ start: '1mA', stop: 2, step: 0.1, limits }))).toMatch(
      /start: expected a voltage/,
    );
  });
});

describe('plausibility bounds', () => {
  it('a gate outside 1 µs–1000 s is refused by the plan; settle at most 10 min', () => {
    expect(problems(sweepPlanSchema.safeParse({ start: 1, stop: 2, step: 0.1, gateS: '100ns', limits }))).toMatch(
      /gateS: at least 1 µs/,
    );
    expect(problems(sweepPlanSchema.safeParse({ start: 1, stop: 2, step: 0.1, gateS: 6000, limits }))).toMatch(
      /gateS: at most 1000 s/,
    );
    expect(
      problems(
        sweepPlanSchema.safeParse({
          start: 1,
          stop: 2,
          step: 0.1,
          settle: { mode: 'fixed', seconds: '15min' },
          limits,
        }),
      ),
    ).toMatch(/settle\.seconds: at most 600 s/);
    expect(
      problems(
        pushingPlanSchema.safeParse({
          controlV: 1,
          supplyStartV: 3,
          supplyStopV: 3.6,
          supplyStepV: 0.1,
          maxSupplyV: 3.6,
          settleS: '1h',
          limits,
        }),
      ),
    ).toMatch(/settleS: at most 600 s/);
  });

  it('a drift interval shorter than gate + one reading is refused', () => {
    const text = problems(driftPlanSchema.safeParse({ controlV: 1, intervalS: '10ms', gateS: '100ms', limits }));
    expect(text).toMatch(
      /intervalS: 0\.01 s is shorter than one reading \(gateS 0.1 s \+ 20 ms\); use at least 0.12 s/,
    );
    expect(driftPlanSchema.safeParse({ controlV: 1, intervalS: '120ms', gateS: '100ms', limits }).success).toBe(true);
  });

  it('a control-channel current limit above 100 mA needs an explicit acknowledgement', () => {
    expect(
      problems(
        sweepPlanSchema.safeParse({ start: 1, stop: 2, step: 0.1, limits: { maxControlV: 5, currentLimitA: '0.5A' } }),
      ),
    ).toMatch(/limits\.currentLimitA: 0\.5 A is above 100 mA.*"acknowledgeHighCurrent": true/);
    expect(
      sweepPlanSchema.safeParse({
        start: 1,
        stop: 2,
        step: 0.1,
        limits: { maxControlV: 5, currentLimitA: '0.5A', acknowledgeHighCurrent: true },
      }).success,
    ).toBe(true);
  });

  it('a drift log is capped at 10,000,000 readings', () => {
    expect(problems(driftPlanSchema.safeParse({ controlV: 1, intervalS: '1s', durationS: '200d', limits }))).toMatch(
      /durationS: gives more than 10000000 readings/,
    );
  });

  it('an explicit point list is capped like a stepped sweep', () => {
    expect(problems(sweepPlanSchema.safeParse({ points: new Array(100_001).fill(1), limits }))).toMatch(
      /points: at most 100000 points/,
    );
  });
});
