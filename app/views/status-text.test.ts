import { describe, expect, it } from 'vitest';
import { stripRunText } from './status-text.ts';

describe('status strip words', () => {
  it('names the run, its DUT, its progress and the time since it started', () => {
    expect(stripRunText({ kind: 'drift', dut: 'osc-7', done: 42, total: 120, elapsedS: 65.4 })).toBe(
      'Drift log · osc-7 · 42 of 120 readings · running 1 min 05 s',
    );
    expect(stripRunText({ kind: 'sweep', dut: 'lo-2', done: 3, total: 0, elapsedS: null })).toBe(
      'Gain sweep · lo-2 · 3 points · running —',
    );
  });
});

describe('safe-state words', () => {
  it('reads the safe level and the output rule from the plan', async () => {
    const { safeStateWords } = await import('./status-text.ts');
    expect(safeStateWords({ safe: { controlV: 0.25, outputOff: true } })).toBe(
      'the control voltage goes to 0.25 V (the safe level), then the supply output turns off',
    );
    expect(safeStateWords({ safe: { controlV: 1, outputOff: false } })).toBe(
      'the control voltage goes to 1 V (the safe level); the plan keeps the output on',
    );
    // A plan without a safe block gets the schema's default: 0 V, output off.
    expect(safeStateWords({})).toMatch(/^the control voltage goes to 0 V .* turns off$/);
  });
});

describe('lost-link words', () => {
  it('names the lost instrument with the address it was reached at (none for the simulator)', async () => {
    const { linkText, lostLinksText } = await import('./status-text.ts');
    expect(linkText('counter', 'lost', 'tcp://192.168.1.40:5025')).toBe('counter link lost (tcp://192.168.1.40:5025)');
    expect(linkText('counter', 'lost', 'sim:counter')).toBe('counter link lost');
    expect(linkText('supply', 'up', 'serial:/dev/ttyUSB0?baud=9600')).toBe('supply answers');
    expect(lostLinksText([])).toBeNull();
    expect(lostLinksText(['counter'])).toBe('counter link lost');
    expect(lostLinksText(['supply', 'counter', 'thermometer'])).toBe('supply, counter and thermometer links lost');
  });
});
