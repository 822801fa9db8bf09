import { describe, expect, it } from 'vitest';
import { conditionRows, planRows, runWindow } from './run-facts.ts';

describe('run facts in words', () => {
  it('lists a sweep plan with units from the key names, nested keys dotted', () => {
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
      ['start', '500 mV'],
      ['stop', '4.5 V'],
      ['step', '250 mV'],
      ['direction', 'up-down'],
      ['readingsPerPoint', '3'],
      ['gateS', '100 ms'],
      ['settle.mode', 'auto'],
      ['settle.maxS', '2 s'],
      ['settle.toleranceCounts', '2'],
      ['limits.maxControlV', '5 V'],
      ['limits.currentLimitA', '20 mA'],
      ['safe.controlV', '0 V'],
      ['safe.outputOff', 'yes'],
    ]);
  });

  it('gives the window with its length, and the conditions at start and end', () => {
    const text = runWindow({ startedAt: '2026-03-04T05:06:07.000Z', endedAt: '2026-03-04T05:21:07.000Z' });
    expect(text).toMatch(/→ .*\(15 min 00 s\)$/);
    expect(runWindow({ startedAt: '2026-03-04T05:06:07.000Z', endedAt: null })).toMatch(/still running$/);
    expect(conditionRows({ conditions: { dutSupplyV: { start: 3.301, end: 3.299 }, temperatureC: { start: 23.5, end: null } } })).toEqual([
      ['DUT supply', '3.301 V at start, 3.299 V at end'],
      ['Temperature', '23.50 °C at start, — at end'],
    ]);
  });
});
