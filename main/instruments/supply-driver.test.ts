import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { ChannelLimitError, InstrumentError, ReplyFormatError, UnsupportedOperationError } from './errors.ts';
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
      'INST:NSEL 1;:SOUR:VOLT 2.5',
      'INST:NSEL 1;:SOUR:CURR 0.05',
      'INST:NSEL 1;:SOUR:VOLT:PROT 5.5',
      'INST:NSEL 2;:OUTP ON',
      'INST:NSEL 1;:SOUR:VOLT?',
      'INST:NSEL 1;:OUTP?',
      'INST:NSEL 1;:MEAS:VOLT?',
      'INST:NSEL 1;:MEAS:CURR?',
    ]);
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
    const kelvin = parseProfile(
      { schema: 'tunebench.profile/1', role: 'thermometer', unit: 'K', commands: { readTemperature: 'MEAS:TEMP?' } },
      'k',
    );
    expect(await createThermometer(session, kelvin as ThermometerProfile).readTemperature()).toBeCloseTo(25, 10);
    replies.push('77');
    const fahrenheit = parseProfile(
      { schema: 'tunebench.profile/1', role: 'thermometer', unit: 'F', commands: { readTemperature: 'MEAS:TEMP?' } },
      'f',
    );
    expect(await createThermometer(session, fahrenheit as ThermometerProfile).readTemperature()).toBeCloseTo(25, 10);
  });
});

describe('SupplyDriver channel ceilings and readback ranges (issue 8 item 1, issue 15 item 4)', () => {
  function okSupply(replies: Record<string, string> = {}) {
    const { transport, session } = link((cmd, l) => {
      if (cmd === 'SYST:ERR?') return l.feed('+0,"No error"\n');
      for (const [suffix, reply] of Object.entries(replies)) if (cmd.endsWith(suffix)) return l.feed(`${reply}\n`);
    });
    return { transport, session };
  }

  it("refuses a write above a channel's ceiling before sending anything; the lower of two purposes holds", async () => {
    const { transport, session } = okSupply();
    await session.open();
    const supply = createSupply(session, await loadProfile('supply-scpi', { role: 'supply' }));
    await supply.setVoltage(1, 7); // no ceiling declared yet
    supply.limitChannel(1, 'control', 5);
    supply.limitChannel(1, 'dut-supply', 5.775); // both purposes on one channel: 5 V holds
    await supply.setVoltage(1, 5);
    const before = transport.written.length;
    const error = await supply.setVoltage(1, 5.5).catch((e: unknown) => e);
    expect(error).toBeInstanceOf(ChannelLimitError);
    expect((error as Error).message).toMatch(
      /refused to set channel 1 to 5\.5 V, above its ceiling 5 V \(limits\.maxControlV\); nothing was written/,
    );
    expect(transport.written.length).toBe(before);
    supply.limitChannel(2, 'dut-supply', 3.78);
    await expect(supply.setVoltage(2, 3.8)).rejects.toThrow(/ceiling 3\.78 V \(DUT supply OVP level\)/);
    await supply.setVoltage(2, 3.78);
  });

  it('an urgent write goes straight out: no error-queue read, even while a resync is owed', async () => {
    const { transport, session } = okSupply();
    await session.open();
    const supply = createSupply(session, await loadProfile('supply-scpi', { role: 'supply' }));
    await supply.setOutput(1, false, { urgent: true });
    await supply.setVoltage(1, 0, { urgent: true });
    expect(transport.written).toEqual(['INST:NSEL 1;:OUTP OFF', 'INST:NSEL 1;:SOUR:VOLT 0']);
  });

  it("a readback beyond the profile's ratings is a fault, not a value", async () => {
    const { session } = okSupply({ 'SOUR:VOLT?': '1e308', 'MEAS:VOLT?': '-150', 'MEAS:CURR?': '+2.5E+01' });
    await session.open();
    const supply = createSupply(session, await loadProfile('supply-scpi', { role: 'supply' }));
    await expect(supply.getVoltageSetpoint(1)).rejects.toThrow(/within ±100 V \(profile ratings\.maxVoltageV\)/);
    await expect(supply.measureVoltage(1)).rejects.toBeInstanceOf(ReplyFormatError);
    await expect(supply.measureCurrent(1)).rejects.toThrow(/within ±20 A \(profile ratings\.maxCurrentA\)/);
  });

  it('a thermometer reading outside plausibleC (an open probe reading 1e6 °C) is a fault', async () => {
    const { session } = okSupply({ 'MEAS:TEMP?': '+1.0E+06' });
    await session.open();
    const thermometer = createThermometer(session, await loadProfile('thermometer-scpi', { role: 'thermometer' }));
    await expect(thermometer.readTemperature()).rejects.toThrow(
      /a temperature in -200\.\.1000 °C \(profile plausibleC\)/,
    );
  });
});
