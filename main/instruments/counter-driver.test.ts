import { describe, expect, it } from 'vitest';
import { createCounter } from './counter-driver.ts';
import { DisconnectedError, InstrumentError, ReplyFormatError, TimeoutError } from './errors.ts';
import { loadProfile, parseProfile } from './profile-loader.ts';
import type { CounterProfile } from './profile-schema.ts';
import { ScpiSession } from './scpi-session.ts';
import { FakeClock, flushMicrotasks } from './testing/fake-clock.ts';
import { ScriptedTransport, type Responder } from './testing/scripted-transport.ts';

async function setup(responder: Responder, profile?: CounterProfile) {
  const clock = new FakeClock();
  const link = new ScriptedTransport(responder);
  const p = profile ?? await loadProfile('counter-scpi', { role: 'counter' });
  const session = new ScpiSession({ transport: link, clock, checkErrorsAfterWrite: p.checkErrorsAfterWrite });
  await session.open();
  return { clock, link, session, counter: createCounter(session, p) };
}

const okQueue = (cmd: string, l: ScriptedTransport): boolean => {
  if (cmd === 'SYST:ERR?') l.feed('+0,"No error"\n');
  else if (cmd === '*OPC?') l.feed('1\n');
  else return false;
  return true;
};

describe('CounterDriver', () => {
  it('reads a frequency and maps the three no-signal forms (SCPI-99 NaN 9.91E37, zero, timeout) to no-signal', async () => {
    const replies = ['+4.00012345E+08', '9.91E+37', '+0.000000E+00', '0'];
    const { counter } = await setup((cmd, l) => {
      if (okQueue(cmd, l)) return;
      if (cmd === 'READ?') l.feed(`${replies.shift() ?? ''}\n`);
    });
    expect(await counter.readFrequency()).toEqual({ status: 'ok', frequencyHz: 400012345 });
    expect(await counter.readFrequency()).toEqual({ status: 'no-signal', cause: 'not-a-number' });
    expect(await counter.readFrequency()).toEqual({ status: 'no-signal', cause: 'zero' });
    expect(await counter.readFrequency()).toEqual({ status: 'no-signal', cause: 'zero' });
  });

  it('waits gate + margin for a reading, calls silence no-signal, and never misreads the late value', async () => {
    let answerRead = false;
    const { counter, clock, link } = await setup((cmd, l) => {
      if (cmd === '*OPC?') {
        l.feed('+1.2E+07\n1\n'); // the late reading, then the sync answer
        answerRead = true;
        return;
      }
      if (okQueue(cmd, l)) return;
      if (cmd === 'READ?' && answerRead) l.feed('+2.5E+07\n');
    });
    await counter.setGate(1);
    expect(counter.gateS).toBe(1);
    expect(link.written).toEqual(['SENS:FREQ:APER 1', 'SYST:ERR?']);
    const pending = counter.readFrequency();
    await clock.advance(1.99); // gate 1 s + margin 1 s: not yet
    let settled = false;
    void pending.then(() => { settled = true; });
    await flushMicrotasks();
    expect(settled).toBe(false);
    await clock.advance(0.02);
    expect(await pending).toEqual({ status: 'no-signal', cause: 'timeout' });
    const next = counter.readFrequency();
    await clock.advance(0.1);
    expect(await next).toEqual({ status: 'ok', frequencyHz: 2.5e7 });
    expect(link.written.slice(2)).toEqual(['READ?', '*OPC?', 'READ?']);
  });

  it('throws DisconnectedError (not no-signal) when the link drops mid-reading', async () => {
    const { counter, link } = await setup((cmd, l) => {
      if (cmd === 'READ?') l.drop(new Error('USB adapter unplugged'));
    });
    const error = await counter.readFrequency().catch((e: unknown) => e);
    expect(error).toBeInstanceOf(DisconnectedError);
    expect((error as DisconnectedError).message).toContain('USB adapter unplugged');
    expect(link.isOpen).toBe(false);
  });

  it('rejects garbage, negative and infinite readings with ReplyFormatError', async () => {
    const replies = ['OVERFLOW', '-1.0E+03', '9.9E37', ''];
    const { counter } = await setup((cmd, l) => {
      if (cmd === 'READ?') l.feed(`${replies.shift()}\n`);
    });
    for (let i = 0; i < 4; i += 1) await expect(counter.readFrequency()).rejects.toBeInstanceOf(ReplyFormatError);
  });

  it('honours a profile that does not treat NaN or zero as no-signal, and a belowHz floor', async () => {
    const strict = parseProfile({ schema: 'tunebench.profile/1', role: 'counter', checkErrorsAfterWrite: false,
      noSignal: { notANumber: false, zero: false, timeout: false }, commands: { setGate: 'GATE {gateS}', readFrequency: 'MEAS:FREQ? {gateS}' } }, 'strict');
    const replies = ['9.91E37', '0'];
    const { counter, clock } = await setup((cmd, l) => {
      if (cmd.startsWith('MEAS:FREQ?') && replies.length > 0) l.feed(`${replies.shift()}\n`);
    }, strict as CounterProfile);
    await expect(counter.readFrequency()).rejects.toBeInstanceOf(ReplyFormatError);
    expect(await counter.readFrequency()).toEqual({ status: 'ok', frequencyHz: 0 });
    const silent = counter.readFrequency().catch((e: unknown) => e);
    await clock.advance(2);
    expect((await silent as Error).name).toBe('TimeoutError');
    const floor = parseProfile({ schema: 'tunebench.profile/1', role: 'counter', noSignal: { belowHz: 5 },
      commands: { setGate: 'G {gateS}', readFrequency: 'READ?' } }, 'floor') as CounterProfile;
    const low = await setup((cmd, l) => { if (cmd === 'READ?') l.feed('4.9\n'); }, floor);
    expect(await low.counter.readFrequency()).toEqual({ status: 'no-signal', cause: 'zero' });
  });

  it('refuses a bad gate before sending anything and reports an instrument error on setGate', async () => {
    const { counter, link } = await setup((cmd, l) => {
      if (cmd === 'SYST:ERR?') l.feed(link.written.filter((w) => w === 'SYST:ERR?').length === 1 ? '-222,"Data out of range"\n' : '+0,"No error"\n');
    });
    await expect(counter.setGate(0)).rejects.toThrow(/gateS/);
    await expect(counter.setGate(Number.NaN)).rejects.toThrow(/gateS/);
    // Outside the profile's gate range (default 1 µs–10 s): refused before anything is sent.
    await expect(counter.setGate(20)).rejects.toThrow(/gateS: 20 s is outside the counter's gate range/);
    expect(link.written).toEqual([]);
    const error = await counter.setGate(5).catch((e: unknown) => e);
    expect(error).toBeInstanceOf(InstrumentError);
    expect((error as InstrumentError).code).toBe(-222);
    expect(counter.gateS).toBe(0.1); // unchanged: the instrument refused it
  });

  it('reports a counter that answers nothing at all (not even the resync) as TimeoutError, not no-signal', async () => {
    const { counter, clock } = await setup(() => undefined);
    const first = counter.readFrequency();
    await clock.advance(1.2); // gate 0.1 s + margin 1 s
    expect(await first).toEqual({ status: 'no-signal', cause: 'timeout' });
    const second = counter.readFrequency().catch((e: unknown) => e);
    await clock.advance(2.5);
    const error = await second;
    expect(error).toBeInstanceOf(TimeoutError);
    expect((error as TimeoutError).command).toBe('*OPC?');
  });
});
