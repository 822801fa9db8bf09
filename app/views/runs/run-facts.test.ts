import { describe, expect, it } from 'vitest';
import { conditionRows, planRows, runWindow } from './run-facts.ts';

describe('run facts in words', () => {
  it('lists a sweep plan in the plan editor words, with units from the key names', () => {
    const plan = {
      start: 0.5,
      stop: 4.5,
      step: 0.25,
      direction: 'up-down',
      readingsPerPoint: 3,
      gateS: 0.1,
      settle: { mode: 'auto', maxS: 2, toleranceCounts: 2 },
      limits: { maxControlV: 5, currentLimitA: 0.02 },
      safe: { controlV: 0, outputOff: true },
    };
    expect(planRows(plan)).toEqual([
      ['From', '500 mV'],
      ['To', '4.5 V'],
      ['Step', '250 mV'],
      ['Direction', 'up-down'],
      ['Readings per point', '3'],
      ['Counter gate', '100 ms'],
      ['Settling', 'auto'],
      ['Longest settling wait', '2 s'],
      ['Settled within (counts)', '2'],
      ['Highest control voltage', '5 V'],
      ['Current limit, control port', '20 mA'],
      ['Safe control voltage', '0 V'],
      ['Output off when safe', 'yes'],
    ]);
  });

  it('gives the window with its length, and the conditions at start and end', () => {
    const text = runWindow({ startedAt: '2026-03-04T05:06:07.000Z', endedAt: '2026-03-04T05:21:07.000Z' });
    expect(text).toMatch(/→ .*\(15 min 00 s\)$/);
    expect(runWindow({ startedAt: '2026-03-04T05:06:07.000Z', endedAt: null })).toMatch(/still running$/);
    expect(
      conditionRows({
        conditions: { dutSupplyV: { start: 3.301, end: 3.299 }, temperatureC: { start: 23.5, end: null } },
      }),
    ).toEqual([
      ['DUT supply', '3.301 V at start, 3.299 V at end'],
      ['Temperature', '23.50 °C at start, — at end'],
    ]);
  });
});
