import { afterEach, describe, expect, it } from 'vitest';
import { RealClock } from '../time/real-clock.ts';
import { AddressError, ProfileError, TimeoutError } from './errors.ts';
import { openInstrument } from './open-instrument.ts';
import { ScpiSession } from './scpi-session.ts';
import { FakeClock } from './testing/fake-clock.ts';
import { ScriptedTransport } from './testing/scripted-transport.ts';
import { RESPONDER_IDN, startTcpResponder, type TcpResponderServer } from './testing/scpi-responder.ts';

let server: TcpResponderServer | null = null;
afterEach(async () => {
  await server?.close();
  server = null;
});

describe('openInstrument', () => {
  it('opens a supply from a bench-file entry over TCP with the standard profile, init and error check', async () => {
    server = await startTcpResponder();
    server.responder.errors.push('-113,"Undefined header"'); // left over from before we connected
    const supply = await openInstrument(
      'supply',
      { address: `tcp://127.0.0.1:${server.port}` },
      { clock: new RealClock() },
    );
    expect(server.responder.errors).toEqual([]); // *CLS at init
    expect((await supply.identify()).idn).toBe(RESPONDER_IDN);
    await supply.setVoltage(1, 1.8);
    await supply.setOutput(1, true);
    expect(await supply.getOutput(1)).toBe(true);
    expect(await supply.measureVoltage(1)).toBe(1.8);
    await supply.close();
  });

  it('opens a counter on an injected sim transport by role', async () => {
    const roles: string[] = [];
    const counter = await openInstrument(
      'counter',
      { address: 'sim' },
      {
        clock: new FakeClock(),
        sim: (role) => {
          roles.push(role);
          return new ScriptedTransport((cmd, l) => {
            if (cmd === 'READ?') l.feed('+1.0000015E+07\n');
            if (cmd === 'SYST:ERR?') l.feed('+0,"No error"\n');
          }, `sim:${role}`);
        },
      },
    );
    expect(roles).toEqual(['counter']);
    expect(await counter.readFrequency()).toEqual({ status: 'ok', frequencyHz: 10000015 });
    await counter.close();
  });

  it("names the role and the address in a failure after bring-up, keeping its class (a run's reason must say which instrument)", async () => {
    const clock = new FakeClock();
    const supply = await openInstrument(
      'supply',
      { address: 'sim' },
      {
        clock,
        sim: (role) =>
          new ScriptedTransport((cmd, l) => {
            // Answers the bring-up's error queue, then falls silent on measurements.
            if (cmd === 'SYST:ERR?') l.feed('+0,"No error"\n');
          }, `sim:${role}`),
      },
    );
    const failure = supply.measureVoltage(1).then(
      () => null,
      (error: unknown) => error,
    );
    await clock.advance(10);
    const error = await failure;
    expect(error).toBeInstanceOf(TimeoutError);
    expect((error as Error).message).toBe('supply at sim:supply: no reply to INST:NSEL 1;:MEAS:VOLT? within 2 s');
    await supply.close();
  });

  it('fails with a typed error for a bad address or profile before touching a link', async () => {
    await expect(openInstrument('counter', { address: 'sim' }, { clock: new FakeClock() })).rejects.toBeInstanceOf(
      AddressError,
    );
    await expect(
      openInstrument(
        'counter',
        { address: 'tcp://127.0.0.1:5025', profile: 'supply-scpi' },
        { clock: new FakeClock() },
      ),
    ).rejects.toBeInstanceOf(ProfileError);
  });

  it('a session reopen does not report its own close as a lost link', async () => {
    const events: string[] = [];
    const transport = new ScriptedTransport((cmd, l) => l.feed('1\n'));
    const session = new ScpiSession({ transport, clock: new FakeClock(), onEvent: (e) => events.push(e.type) });
    await session.open();
    await session.reconnect();
    expect(events).toEqual(['reconnected']);
    expect(transport.opens).toBe(2);
  });
});
