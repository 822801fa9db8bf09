import { describe, expect, it } from 'vitest';
import { timeStepFor, timeTickLabel, timeTicks } from './time-ticks.ts';

describe('time axis ticks in clock units', () => {
  it('a 150 s log on a 380 px plot steps in 30 s and reads in minutes and seconds, not 0.333333 min', () => {
    const step = timeStepFor(150, 380, 70);
    expect(step).toBe(30);
    expect(timeTicks(0, 150, step).map((t) => timeTickLabel(t, step))).toEqual([
      '0 s',
      '30 s',
      '1 min',
      '1 min 30 s',
      '2 min',
      '2 min 30 s',
    ]);
  });

  it('a 10 min log steps in whole minutes', () => {
    const step = timeStepFor(600, 380, 70);
    expect(step).toBe(120);
    expect(timeTicks(3, 600, step).map((t) => timeTickLabel(t, step))).toEqual([
      '2 min',
      '4 min',
      '6 min',
      '8 min',
      '10 min',
    ]);
  });

  it('a 12 h overnight log steps in hours, minutes shown only when not whole', () => {
    const step = timeStepFor(12 * 3600, 1000, 70);
    expect(step).toBe(3600);
    expect(timeTickLabel(5400, 1800)).toBe('1 h 30 min');
    expect(timeTickLabel(7 * 3600, step)).toBe('7 h');
  });

  it('a three-day log with a known start reads in local dates', () => {
    const start = new Date(2026, 2, 4, 0, 0, 0).getTime(); // local midnight, 4 March 2026
    const step = timeStepFor(3 * 86_400, 900, 80);
    expect(step).toBe(43_200);
    const label = timeTickLabel(86_400 + 43_200, step, start);
    expect(label).toMatch(/05.*12:00$/);
    expect(timeTickLabel(2 * 86_400, 86_400)).toBe('2 d');
  });

  it('sub-second zooms keep just the decimals of the step', () => {
    expect(timeStepFor(1.2, 600, 70)).toBe(0.2);
    expect(timeTicks(10, 11.2, 0.2).map((t) => timeTickLabel(t, 0.2))).toEqual([
      '10.0 s',
      '10.2 s',
      '10.4 s',
      '10.6 s',
      '10.8 s',
      '11.0 s',
      '11.2 s',
    ]);
  });
});
