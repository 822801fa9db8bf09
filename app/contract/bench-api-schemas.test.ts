import { describe, expect, it } from 'vitest';
import { BENCH_METHODS, DESKTOP_METHODS } from './wire.ts';
import { benchMethodParams, isBenchMethod, parseCallParams, runIdSchema } from './bench-api-schemas.ts';

const plan = { start: '0.5', stop: 4.5, step: '50m', limits: { maxControlV: 5, currentLimitA: '50m' } };

describe('BenchApi parameter schemas', () => {
  it('cover every method of the contract and nothing else', () => {
    expect(Object.keys(benchMethodParams).sort()).toEqual([...BENCH_METHODS, ...DESKTOP_METHODS].sort());
    expect(isBenchMethod('startSweep')).toBe(true);
    expect(isBenchMethod('constructor')).toBe(false);
    expect(isBenchMethod('__proto__')).toBe(false);
  });

  it('accept a sweep plan with SI strings and hand on numbers with defaults filled', () => {
    const result = parseCallParams('startSweep', [plan, 'clock-mult-vco-3']);
    expect(result.ok).toBe(true);
    if (!result.ok) return;
    const [parsed, dutId] = result.args as [Record<string, unknown>, string];
    expect(parsed.step).toBeCloseTo(0.05, 12);
    expect(parsed.start).toBe(0.5);
    expect(parsed.direction).toBe('up');
    expect(parsed.limits).toEqual({ maxControlV: 5, currentLimitA: 0.05 });
    expect(dutId).toBe('clock-mult-vco-3');
  });

  it('name the field of a bad plan by parameter name', () => {
    const bad = parseCallParams('startSweep', [{ ...plan, limits: { maxControlV: 'lots', currentLimitA: 0.05 } }, 'x']);
    expect(bad).toMatchObject({ ok: false, field: 'plan.limits.maxControlV' });
    expect(parseCallParams('startDrift', [{ controlV: 2 }, 'x'])).toMatchObject({ ok: false, field: 'plan.limits' });
    expect(parseCallParams('startSweep', [plan, ''])).toMatchObject({ ok: false, field: 'dutId' });
  });

  it('refuse the wrong number or shape of parameters', () => {
    expect(parseCallParams('listRuns', ['extra'])).toMatchObject({ ok: false, field: 'params' });
    expect(parseCallParams('openRun', 'id')).toMatchObject({ ok: false, field: 'params' });
    expect(parseCallParams('connect', ['simulated'])).toMatchObject({ ok: false, field: 'config' });
    expect(parseCallParams('connect', ['sim'])).toEqual({ ok: true, args: ['sim'] });
  });

  it('refuse run ids that could leave the runs folder', () => {
    for (const id of [
      '..',
      '../x',
      'a/b',
      'a\\b',
      '.trash',
      'a..b',
      '',
      'x\u0000',
      '/etc/passwd',
      'C:evil',
      'a'.repeat(129),
    ]) {
      expect(runIdSchema.safeParse(id).success, id).toBe(false);
    }
    for (const id of ['20261202-014512-sensor-osc-a', 'run_1.v2', 'A'])
      expect(runIdSchema.safeParse(id).success, id).toBe(true);
  });

  it('refuse import file names with folders and DUT ids with line breaks', () => {
    expect(parseCallParams('importCsv', ['../x.csv', 'a,b\n', 'd'])).toMatchObject({ ok: false, field: 'fileName' });
    expect(parseCallParams('importCsv', ['x.csv', 'a,b\n', 'd\ne'])).toMatchObject({ ok: false, field: 'dutId' });
    expect(parseCallParams('addNote', ['r1', 'line one\nline two'])).toMatchObject({ ok: true });
  });
});
