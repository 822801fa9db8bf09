/**
 * The campaign plan is as strict as every other plan file: an unknown key at
 * any level is refused naming the nearest known one, and voltages and times
 * go through the one quantity grammar (si.ts), so a misspelt "dwelS" never
 * soaks for the default 10 min in its place.
 */
import { describe, expect, it } from 'vitest';
import { campaignPlanSchema, type CampaignPlanInput } from './campaign-plan.ts';
import { describeIssues } from './schema-kit.ts';

const base = {
  temperaturesC: [-10, 25, 60],
  supplyV: [4.75, 5, 5.25],
  maxSupplyV: 5.5,
  units: ['unit-a'],
  chamber: { minC: -40, maxC: 85, maxRateCPerMin: 3 },
  sweep: { start: 1.5, stop: 4.2, step: 0.1, limits: { maxControlV: 5, currentLimitA: 0.02 } },
} satisfies CampaignPlanInput;

function problems(input: unknown): string {
  const result = campaignPlanSchema.safeParse(input);
  return result.success ? '' : describeIssues(result.error);
}

describe('campaign plan: unknown keys are refused at every level, naming the field', () => {
  it('at the top, with a did-you-mean', () => {
    expect(problems({ ...base, temperatureC: [25] })).toMatch(
      /^\(root\): unknown key "temperatureC" \(did you mean "temperaturesC"\?\)/m,
    );
  });

  it('in soak, chamber, the sweep and its limits', () => {
    expect(problems({ ...base, soak: { dwelS: 300 } })).toMatch(
      /^soak: unknown key "dwelS" \(did you mean "dwellS"\?\)/m,
    );
    expect(problems({ ...base, chamber: { ...base.chamber, maxRateCperMin: 3 } })).toMatch(
      /^chamber: unknown key "maxRateCperMin" \(did you mean "maxRateCPerMin"\?\)/m,
    );
    expect(problems({ ...base, sweep: { ...base.sweep, stepV: 0.1 } })).toMatch(/^sweep: unknown key "stepV"/m);
    expect(
      problems({ ...base, sweep: { ...base.sweep, limits: { maxControlV: 5, currentLimitA: 0.02, maxcontrolv: 4 } } }),
    ).toMatch(/^sweep\.limits: unknown key "maxcontrolv" \(did you mean "maxControlV"\?\)/m);
  });

  it('a key with no near miss lists the keys the object takes', () => {
    expect(problems({ ...base, colour: 'red' })).toMatch(
      /unknown key "colour"; this object takes: temperaturesC, supplyV/,
    );
  });

  it('"$schema" is allowed at the top', () => {
    expect(problems({ ...base, $schema: '../schemas/campaign-plan.schema.json' })).toBe('');
  });
});

describe('campaign plan: quantities in the one grammar', () => {
  it('voltages and frequencies take prefixes and units; times take their unit', () => {
    const plan = campaignPlanSchema.parse({
      ...base,
      supplyV: ['4.75V', '5V', '5250mV'],
      maxSupplyV: '5.5V',
      nominalControlV: '3V',
      headroomTargetHz: '150kHz',
      tuningWindowV: ['1.8V', '4V'],
      soak: { dwellS: '5min', timeoutS: '2h', readIntervalS: '10s' },
    });
    expect(plan.supplyV).toEqual([4.75, 5, 5.25]);
    expect(plan.maxSupplyV).toBe(5.5);
    expect(plan.headroomTargetHz).toBe(150_000);
    expect(plan.tuningWindowV).toEqual([1.8, 4]);
    expect(plan.soak.dwellS).toBe(300);
    expect(plan.soak.timeoutS).toBe(7200);
  });

  it('a wrong unit or a bare "m" on a time is refused naming the field', () => {
    expect(problems({ ...base, maxSupplyV: '5.5A' })).toMatch(/^maxSupplyV: /m);
    expect(problems({ ...base, supplyV: [5, '5Hz'] })).toMatch(/^supplyV\.1: /m);
    expect(problems({ ...base, soak: { dwellS: '5m' } })).toMatch(/^soak\.dwellS: .*min/m);
    expect(problems({ ...base, headroomTargetHz: '150kV' })).toMatch(/^headroomTargetHz: /m);
  });

  it('limits between fields name the field that breaks them', () => {
    expect(problems({ ...base, temperaturesC: [-50, 25] })).toMatch(
      /^temperaturesC\.0: -50 °C is outside chamber\.minC/m,
    );
    expect(problems({ ...base, supplyV: [5, 6] })).toMatch(/^supplyV\.1: 6 V is above maxSupplyV/m);
    expect(problems({ ...base, nominalSupplyV: 6 })).toMatch(/^nominalSupplyV: /m);
    expect(problems({ ...base, safeC: 100 })).toMatch(/^safeC: 100 °C is outside/m);
    expect(problems({ ...base, rampCPerMin: 5 })).toMatch(/^rampCPerMin: 5 °C\/min exceeds chamber\.maxRateCPerMin/m);
    expect(problems({ ...base, units: ['a', 'a'] })).toMatch(/^units: unit ids must be distinct/m);
    expect(problems({ ...base, units: ['a\u202eb'] })).toMatch(/^units\.0: must not contain control characters/m);
    expect(problems({ ...base, tuningWindowV: [3, 2] })).toMatch(/^tuningWindowV\.1: /m);
  });
});
