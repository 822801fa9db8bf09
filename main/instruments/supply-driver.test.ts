import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { InstrumentError, ReplyFormatError, UnsupportedOperationError } from './errors.ts';
import { loadProfile, parseProfile } from './profile-loader.ts';
import { ScpiSession } from './scpi-session.ts';
import { createSupply } from './supply-driver.ts';
import { createThermometer } from './thermometer-driver.ts';
import type { ThermometerProfile } from './profile-schema.ts';
import { FakeClock } from './testing/fake-clock.ts';
import { ScriptedTransport, type Responder } from './testing/scripted-transport.ts';

const FIXTURES = path.resolve(import.meta.dirname, '../../test/fixtures/profiles');

function link(responder: Responder, terminator = '\n') {
  const transport = new ScriptedTransport(responder);
  const session = new ScpiSession({ transport, clock: new FakeClock(), terminator });
  return { transport, session };
}

describe('SupplyDriver (supply-scpi)', () => {
  it('sends the standard SCPI tree with the channel selected, and reads values back', async () => {
    const errors: string[] = [];
    const { transport, session } = link((cmd, l) => {
      if (cmd === 'SYST:ERR?') return l.feed(`${errors.shift() ?? '+0,"No error"'}\n`);
      if (cmd.endsWith('SOUR:VOLT?')) return l.feed('+2.500000E+00\n');
      if (cmd.endsWith('OUTP?')) return l.feed('1\n');
      if (cmd.endsWith('MEAS:VOLT?')) return l.feed('+2.499700E+00\n');
      if (cmd.endsWith('MEAS:CURR?')) return l.feed('+1.250000E-02\n');
    });
    await session.open();
    const supply = createSupply(session, await loadProfile('supply-scpi', { role: 'supply' }));
    await supply.setVoltage(1, 2.5);
    await supply.setCurrentLimit(1, 0.05);
    await supply.setOverVoltageProtection(1, 5.5);
    await supply.setOutput(2, true);
    expect(await supply.getVoltageSetpoint(1)).toBe(2.5);
    expect(await supply.getOutput(1)).toBe(true);
    expect(await supply.measureVoltage(1)).toBe(2.4997);
    expect(await supply.measureCurrent(1)).toBe(0.0125);
    expect(transport.written.filter((w) => w !== 'SYST:ERR?')).toEqual([
      'INST:NSEL 1;:SOUR:VOLT 2.5', 'INST:NSEL 1;:SOUR:CURR 0.05', 'INST:NSEL 1;:SOUR:VOLT:PROT 5.5', 'INST:NSEL 2;:OUTP ON',
      'INST:NSEL 1;:SOUR:VOLT?', 'INST:NSEL 1;:OUTP?', 'INST:NSEL 1;:MEAS:VOLT?', 'INST:NSEL 1;:MEAS:CURR?']);
    expect(transport.written.filter((w) => w === 'SYST:ERR?')).toHaveLength(4); // one per write
    errors.push('-222,"Data out of range"');
    const error = await supply.setVoltage(1, 40).catch((e: unknown) => e);
    expect(error).toBeInstanceOf(InstrumentError);
    expect((error as InstrumentError).command).toBe('INST:NSEL 1;:SOUR:VOLT 40');
  });

  it('refuses bad channels and non-finite setpoints before anything is sent', async () => {
    const { transport, session } = link(() => undefined);
    await session.open();
    const supply = createSupply(session, await loadProfile('supply-scpi', { role: 'supply' }));
    await expect(supply.setVoltage(3, 1)).rejects.toThrow(/channel: 3 is not 1..2/);
    await expect(supply.setVoltage(0, 1)).rejects.toThrow(RangeError);
    await expect(supply.setVoltage(1, Number.NaN)).rejects.toThrow(/non-finite/);
    await expect(supply.getOutput(1.5)).rejects.toThrow(RangeError);
    expect(transport.written).toEqual([]);
  });

  it('drives a one-channel CR LF profile without error checks and refuses what it lacks', async () => {
    const profile = await loadProfile(path.join(FIXTURES, 'supply-single-scpi.json'), { role: 'supply' });
    const { transport, session } = link((cmd, l) => {
      if (cmd === 'VOLT?\r') l.feed('garbage\r\n');
    }, profile.lineTerminator);
    await session.open();
    const supply = createSupply(session, profile);
    await supply.setVoltage(1, 0.25);
    await supply.setOutput(1, false);
    expect(transport.written).toEqual(['VOLT 0.25\r', 'OUTP OFF\r']); // scripted link splits on LF only
    await expect(supply.getVoltageSetpoint(1)).rejects.toBeInstanceOf(ReplyFormatError);
    await expect(supply.setOverVoltageProtection(1, 5)).rejects.toBeInstanceOf(UnsupportedOperationError);
    await expect(supply.measureCurrent(1)).rejects.toBeInstanceOf(UnsupportedOperationError);
    expect(supply.capabilities.channels).toBe(1);
  });
});

describe('ThermometerDriver', () => {
  it('reads °C, converts K and F (ITS-90 / SI definitions, common practice), and refuses an open-probe NaN', async () => {
    const replies = ['+2.345000E+01', '9.91E37'];
    const { session } = link((cmd, l) => {
      if (cmd === 'MEAS:TEMP?') l.feed(`${replies.shift() ?? '298.15'}\n`);
      if (cmd === '*IDN?') l.feed('Tunebench Test,Probe Reader,P7,2.0\n');
    });
    await session.open();
    const thermometer = createThermometer(session, await loadProfile('thermometer-scpi', { role: 'thermometer' }));
    expect(await thermometer.readTemperature()).toBe(23.45);
    await expect(thermometer.readTemperature()).rejects.toBeInstanceOf(ReplyFormatError);
    expect((await thermometer.identify()).model).toBe('Probe Reader');
    const kelvin = parseProfile({ schema: 'tunebench.profile/1', role: 'thermometer', unit: 'K', commands: { readTemperature: 'MEAS:TEMP?' } }, 'k');
    expect(await createThermometer(session, kelvin as ThermometerProfile).readTemperature()).toBeCloseTo(25, 10);
    replies.push('77');
    const fahrenheit = parseProfile({ schema: 'tunebench.profile/1', role: 'thermometer', unit: 'F', commands: { readTemperature: 'MEAS:TEMP?' } }, 'f');
    expect(await createThermometer(session, fahrenheit as ThermometerProfile).readTemperature()).toBeCloseTo(25, 10);
  });
});
