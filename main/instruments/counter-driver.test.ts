import { describe, expect, it } from 'vitest';
import { createCounter } from './counter-driver.ts';
import { AlignmentError, DisconnectedError, InstrumentError, ReplyFormatError } from './errors.ts';
import { loadProfile, parseProfile } from './profile-loader.ts';
import type { CounterProfile } from './profile-schema.ts';
import { ScpiSession } from './scpi-session.ts';
import { FakeClock, flushMicrotasks } from './testing/fake-clock.ts';
import { ScriptedTransport, type Responder } from './testing/scripted-transport.ts';

async function setup(responder: Responder, profile?: CounterProfile) {
  const clock = new FakeClock();
  const link = new ScriptedTransport(responder);
  const p = profile ?? (await loadProfile('counter-scpi', { role: 'counter' }));
  const session = new ScpiSession({ transport: link, clock, checkErrorsAfterWrite: p.checkErrorsAfterWrite });
  await session.open();
  return { clock, link, session, counter: createCounter(session, p) };
}

/** The token the session's resync asked for (`*ESE n;*ESE?`), or null. */
const esToken = (cmd: string): string | null => /^\*ESE (\d+);\*ESE\?$/.exec(cmd)?.[1] ?? null;

const okQueue = (cmd: string, l: ScriptedTransport): boolean => {
  if (cmd === 'SYST:ERR?') l.feed('+0,"No error"\n');
  else if (cmd === '*OPC?') l.feed('1\n');
  else if (esToken(cmd) !== null) l.feed(`${esToken(cmd)}\n`);
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

  it('waits gate + margin, resyncs at once, and calls silence no-signal only when nothing came late', async () => {
    const { counter, clock, link } = await setup((cmd, l) => {
      if (okQueue(cmd, l)) return;
      // READ? never answered: the counter sees no oscillation.
    });
    await counter.setGate(1);
    expect(counter.gateS).toBe(1);
    expect(link.written).toEqual(['SENS:FREQ:APER 1', 'SYST:ERR?']);
    const pending = counter.readFrequency();
    await clock.advance(1.99); // gate 1 s + margin 1 s: not yet
    let settled = false;
    void pending.then(() => {
      settled = true;
    });
    await flushMicrotasks();
    expect(settled).toBe(false);
    await clock.advance(0.02);
    expect(await pending).toEqual({ status: 'no-signal', cause: 'timeout' });
    expect(link.written.slice(2).map((c) => c.replace(/\d+/g, 'n'))).toEqual(['READ?', '*ESE n;*ESE?']);
  });

  it('re-takes a reading that came late, so the late value is never recorded as the next one (issue 15 item 3)', async () => {
    let reads = 0;
    let late: string | null = null;
    const { counter, clock, link } = await setup((cmd, l) => {
      const token = esToken(cmd);
      if (token !== null) {
        // The instrument answers in order: the late reading first, then the token.
        l.feed(`${late ?? ''}${late === null ? '' : '\n'}${token}\n`);
        late = null;
        return;
      }
      if (okQueue(cmd, l)) return;
      if (cmd === 'READ?') {
        reads += 1;
        if (reads === 1)
          late = '+8.620000E+03'; // slips past gate + margin
        else l.feed('+7.250000E+03\n');
      }
    });
    const pending = counter.readFrequency();
    await clock.advance(1.2);
    expect(await pending).toEqual({ status: 'ok', frequencyHz: 7250 });
    expect(link.written.map((c) => c.replace(/\d+/g, 'n'))).toEqual(['READ?', '*ESE n;*ESE?', 'READ?']);
  });

  it('refuses a bare "1" from an NR3 counter and readings outside 0 < f ≤ maxInputHz (issue 15 items 3 and 4)', async () => {
    const replies = ['1', '1e308', '+4.1E+09', '+1.00000000E+04'];
    const nr3 = parseProfile(
      {
        schema: 'tunebench.profile/1',
        role: 'counter',
        replyFormat: 'nr3',
        maxInputHz: 4e9,
        commands: { setGate: 'G {gateS}', readFrequency: 'READ?' },
      },
      'nr3',
    ) as CounterProfile;
    const { counter } = await setup((cmd, l) => {
      if (okQueue(cmd, l)) return;
      if (cmd === 'READ?') l.feed(`${replies.shift()}\n`);
    }, nr3);
    await expect(counter.readFrequency()).rejects.toThrow(/NR3 form.*got "1"/);
    await expect(counter.readFrequency()).rejects.toThrow(/0 < f ≤ 4000000000 Hz \(profile maxInputHz\)/);
    await expect(counter.readFrequency()).rejects.toBeInstanceOf(ReplyFormatError);
    expect(await counter.readFrequency()).toEqual({ status: 'ok', frequencyHz: 1e4 });
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
    const strict = parseProfile(
      {
        schema: 'tunebench.profile/1',
        role: 'counter',
        checkErrorsAfterWrite: false,
        noSignal: { notANumber: false, zero: false, timeout: false },
        commands: { setGate: 'GATE {gateS}', readFrequency: 'MEAS:FREQ? {gateS}' },
      },
      'strict',
    );
    const replies = ['9.91E37', '0'];
    const { counter, clock } = await setup((cmd, l) => {
      if (okQueue(cmd, l)) return;
      if (cmd.startsWith('MEAS:FREQ?') && replies.length > 0) l.feed(`${replies.shift()}\n`);
    }, strict as CounterProfile);
    await expect(counter.readFrequency()).rejects.toBeInstanceOf(ReplyFormatError);
    // Zero is not a frequency (0 < f) when the profile does not call it no-signal.
    await expect(counter.readFrequency()).rejects.toBeInstanceOf(ReplyFormatError);
    const silent = counter.readFrequency().catch((e: unknown) => e);
    await clock.advance(2);
    expect(((await silent) as Error).name).toBe('TimeoutError');
    const floor = parseProfile(
      {
        schema: 'tunebench.profile/1',
        role: 'counter',
        noSignal: { belowHz: 5 },
        commands: { setGate: 'G {gateS}', readFrequency: 'READ?' },
      },
      'floor',
    ) as CounterProfile;
    const low = await setup((cmd, l) => {
      if (cmd === 'READ?') l.feed('4.9\n');
    }, floor);
    expect(await low.counter.readFrequency()).toEqual({ status: 'no-signal', cause: 'zero' });
  });

  it('refuses a bad gate before sending anything and reports an instrument error on setGate', async () => {
    const { counter, link } = await setup((cmd, l) => {
      if (cmd === 'SYST:ERR?')
        l.feed(
          link.written.filter((w) => w === 'SYST:ERR?').length === 1 ? '-222,"Data out of range"\n' : '+0,"No error"\n',
        );
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

  it('reports a counter that answers nothing at all (not even the resync) as out of step, never no-signal', async () => {
    const { counter, clock } = await setup(() => undefined);
    const first = counter.readFrequency().catch((e: unknown) => e);
    await clock.advance(1.2); // gate 0.1 s + margin 1 s
    await clock.advance(2.5); // the resync's own timeout
    const error = await first;
    expect(error).toBeInstanceOf(AlignmentError);
    expect((error as AlignmentError).message).toMatch(
      /READ\? not proven in step: no answer to the resync \*ESE \d+;\*ESE\?/,
    );
  });
});
