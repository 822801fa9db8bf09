import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { compileTemplate } from './command-template.ts';
import { ProfileError } from './errors.ts';
import { defaultProfileName, listProfiles, loadProfile, parseProfile } from './profile-loader.ts';

const FIXTURES = path.resolve(import.meta.dirname, '../../test/fixtures/profiles');
const userDir = mkdtempSync(path.join(tmpdir(), 'tunebench-profiles-'));
afterAll(() => rmSync(userDir, { recursive: true, force: true }));

const goodSupply = {
  schema: 'tunebench.profile/1',
  role: 'supply',
  capabilities: { channels: 2, measureVoltage: false, measureCurrent: false, overVoltageProtection: false },
  commands: {
    setVoltage: 'SOUR{channel}:VOLT {volts}',
    getVoltageSetpoint: 'SOUR{channel}:VOLT?',
    setCurrentLimit: 'SOUR{channel}:CURR {amps}',
    setOutput: 'OUTP{channel} {state}',
    getOutput: 'OUTP{channel}?',
  },
};

function problem(json: unknown): string {
  try {
    parseProfile(json, 'under-test');
  } catch (error) {
    if (error instanceof ProfileError) return error.message;
    throw error;
  }
  throw new Error('profile was accepted');
}

describe('shipped profiles', () => {
  it('load for every role with the standard SCPI tree', async () => {
    const supply = await loadProfile(defaultProfileName('supply'), { role: 'supply' });
    expect(supply.commands.setVoltage.render({ channel: '1', volts: '2.5' })).toBe('INST:NSEL 1;:SOUR:VOLT 2.5');
    expect(supply.commands.setOutput.render({ channel: '2', state: 'ON' })).toBe('INST:NSEL 2;:OUTP ON');
    expect(supply.commands.measureCurrent?.render({ channel: '2' })).toBe('INST:NSEL 2;:MEAS:CURR?');
    const counter = await loadProfile('counter-scpi', { role: 'counter' });
    expect(counter.commands.setGate.render({ gateS: '0.1' })).toBe('SENS:FREQ:APER 0.1');
    expect(counter.noSignal).toEqual({ notANumber: true, zero: true, timeout: true, belowHz: 0 });
    const thermometer = await loadProfile('thermometer-scpi', { role: 'thermometer' });
    expect(thermometer.commands.readTemperature.render({})).toBe('MEAS:TEMP?');
    expect(thermometer.unit).toBe('C');
  });

  it('are listed, and the user folder overrides a shipped name', async () => {
    writeFileSync(
      path.join(userDir, 'counter-scpi.json'),
      JSON.stringify({
        schema: 'tunebench.profile/1',
        role: 'counter',
        commands: { setGate: 'GATE {gateS}', readFrequency: 'MEAS:FREQ?' },
      }),
    );
    const names = await listProfiles({ userDir });
    expect(names).toEqual(
      expect.arrayContaining([
        { name: 'counter-scpi', source: 'user' },
        { name: 'supply-scpi', source: 'shipped' },
      ]),
    );
    const counter = await loadProfile('counter-scpi', { userDir, role: 'counter' });
    expect(counter.commands.readFrequency.source).toBe('MEAS:FREQ?');
    expect(counter.timeouts).toEqual({ defaultS: 2, measureMarginS: 1 }); // defaults filled in
  });

  it('loads a profile by path (test fixture with CR LF and one channel)', async () => {
    const profile = await loadProfile(path.join(FIXTURES, 'supply-single-scpi.json'), { role: 'supply' });
    expect(profile.name).toBe('supply-single-scpi');
    expect(profile.lineTerminator).toBe('\r\n');
    expect(profile.commands.setOverVoltageProtection).toBeUndefined();
  });

  it('refuses a profile of the wrong role, an unknown name and a bad name', async () => {
    await expect(loadProfile('counter-scpi', { role: 'supply' })).rejects.toThrow(/role: is "counter"/);
    await expect(loadProfile('no-such-profile')).rejects.toThrow(/not found; looked in/);
    await expect(loadProfile('..evil')).rejects.toThrow(/name:/);
    writeFileSync(path.join(userDir, 'broken.json'), '{ "schema": ');
    await expect(loadProfile('broken', { userDir })).rejects.toThrow(/not valid JSON/);
  });
});

describe('profile validation names the field', () => {
  it.each([
    [{ ...goodSupply, schema: 'other/1' }, 'schema'],
    [{ ...goodSupply, role: 'scope' }, 'role'],
    [{ ...goodSupply, commands: { ...goodSupply.commands, setVoltage: undefined } }, 'commands.setVoltage'],
    [{ ...goodSupply, commands: { ...goodSupply.commands, setVoltage: '   ' } }, 'commands.setVoltage'],
    [
      { ...goodSupply, commands: { ...goodSupply.commands, setVoltage: 'VOLT {volt}' } },
      'commands.setVoltage: unknown placeholder {volt}',
    ],
    [
      { ...goodSupply, commands: { ...goodSupply.commands, getOutput: 'OUTP{channel?' } },
      'commands.getOutput: unclosed',
    ],
    [{ ...goodSupply, capabilities: { ...goodSupply.capabilities, channels: 0 } }, 'capabilities.channels'],
    [
      { ...goodSupply, capabilities: { ...goodSupply.capabilities, measureVoltage: true } },
      'commands.measureVoltage: required because capabilities.measureVoltage',
    ],
    [{ ...goodSupply, lineTerminator: ';' }, 'lineTerminator'],
    [{ ...goodSupply, timeouts: { defaultS: -1 } }, 'timeouts.defaultS'],
    [{ ...goodSupply, init: ['*CLS', 'SYST:{x}'] }, 'init.1'],
    [
      { schema: 'tunebench.profile/1', role: 'counter', commands: { setGate: 'APER {volts}', readFrequency: 'READ?' } },
      'commands.setGate',
    ],
    [
      {
        schema: 'tunebench.profile/1',
        role: 'counter',
        noSignal: { belowHz: -1 },
        commands: { setGate: 'A', readFrequency: 'R' },
      },
      'noSignal.belowHz',
    ],
    [
      { schema: 'tunebench.profile/1', role: 'thermometer', unit: 'R', commands: { readTemperature: 'MEAS:TEMP?' } },
      'unit',
    ],
  ])('%#: %s', (json, field) => {
    expect(problem(json)).toContain(field);
  });

  it('accepts the good supply and compiles its placeholders', () => {
    const profile = parseProfile(goodSupply, 'ok');
    expect(profile.role).toBe('supply');
    expect(profile.checkErrorsAfterWrite).toBe(true);
    if (profile.role === 'supply')
      expect(profile.commands.setVoltage.render({ channel: '2', volts: '1E-3' })).toBe('SOUR2:VOLT 1E-3');
  });
});

describe('compileTemplate', () => {
  it('renders placeholders and literal braces', () => {
    const template = compileTemplate('SYST:COMM "{{x}}";VOLT {volts}', ['volts']);
    expect(template.placeholders).toEqual(['volts']);
    expect(template.render({ volts: '3' })).toBe('SYST:COMM "{x}";VOLT 3');
    expect(() => compileTemplate('A}B', [])).toThrow(/stray/);
    expect(() => template.render({})).toThrow(/no value for \{volts\}/);
  });
});

describe('query operations must be queries (issue 15 item 5)', () => {
  it('refuses a readFrequency without "?" (silence would pass for no signal), naming the field', () => {
    expect(() =>
      parseProfile(
        { schema: 'tunebench.profile/1', role: 'counter', commands: { setGate: 'G {gateS}', readFrequency: 'READ' } },
        'mute',
      ),
    ).toThrow(/commands\.readFrequency: must be a query/);
    expect(() =>
      parseProfile(
        { schema: 'tunebench.profile/1', role: 'thermometer', commands: { readTemperature: 'MEAS:TEMP' } },
        'mute',
      ),
    ).toThrow(/commands\.readTemperature: must be a query/);
  });
});
