import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { DisconnectedError, InstrumentError, ReplyFormatError, TimeoutError } from './errors.ts';
import { ScpiSession, type ScpiSessionOptions } from './scpi-session.ts';
import { FakeClock, flushMicrotasks } from './testing/fake-clock.ts';
import { ScriptedTransport, type Responder } from './testing/scripted-transport.ts';

const IDN = 'Bench Works,PS-3,SN0042,1.2.3';

function setup(responder: Responder, options: Partial<ScpiSessionOptions> = {}) {
  const clock = new FakeClock();
  const link = new ScriptedTransport(responder);
  // These cases pin the legacy *OPC? sync; the default token sync has its own tests below.
  const session = new ScpiSession({ transport: link, clock, syncQuery: '*OPC?', ...options });
  return { clock, link, session };
}

/** Settles a promise into a value-or-error record so a test can inspect a rejection later. */
function settle<T>(promise: Promise<T>): Promise<{ value?: T; error?: unknown }> {
  return promise.then(
    (value) => ({ value }),
    (error: unknown) => ({ error }),
  );
}

describe('ScpiSession', () => {
  it('returns replies cut at awkward byte boundaries, CR LF and multi-byte characters included', async () => {
    const { session } = setup((cmd, link) => {
      if (cmd === '*IDN?') link.feed(`${IDN}\r\n`, [1, 2, 13, 29, 30]);
      if (cmd === 'SYST:UNIT?') link.feed('"°C µV"\n', [2, 3, 5]); // splits inside ° and µ
    });
    await session.open();
    expect(await session.identify()).toEqual({
      idn: IDN,
      manufacturer: 'Bench Works',
      model: 'PS-3',
      serial: 'SN0042',
      firmware: '1.2.3',
    });
    expect(await session.query('SYST:UNIT?')).toBe('"°C µV"');
  });

  it('keeps one command in flight and answers concurrent callers in FIFO order', async () => {
    let inFlight = 0;
    let maxInFlight = 0;
    const { session, link } = setup((cmd, l) => {
      inFlight += 1;
      maxInFlight = Math.max(maxInFlight, inFlight);
      setImmediate(() => {
        inFlight -= 1;
        l.feed(`${cmd.replace('MEAS:VOLT? ', '')}\n`);
      });
    });
    await session.open();
    const replies = await Promise.all([1, 2, 3, 4, 5].map((n) => session.query(`MEAS:VOLT? ${n}`)));
    expect(replies).toEqual(['1', '2', '3', '4', '5']);
    expect(maxInFlight).toBe(1);
    expect(link.written).toEqual(['MEAS:VOLT? 1', 'MEAS:VOLT? 2', 'MEAS:VOLT? 3', 'MEAS:VOLT? 4', 'MEAS:VOLT? 5']);
  });

  it('times out on the fake clock and discards the late reply when it arrives before the next query', async () => {
    let slow = true;
    const { session, clock, link } = setup((cmd, l) => {
      if (cmd === 'READ?' && slow) return; // answered late, by hand below
      if (cmd === 'MEAS:VOLT?') l.feed('2.5\n');
    });
    await session.open();
    const first = settle(session.query('READ?', { timeoutS: 1 }));
    await clock.advance(0.999);
    expect(await Promise.race([first, Promise.resolve('pending')])).toBe('pending');
    await clock.advance(0.002);
    const outcome = await first;
    expect(outcome.error).toBeInstanceOf(TimeoutError);
    expect((outcome.error as TimeoutError).timeoutS).toBe(1);
    expect(session.isOutOfStep).toBe(true);
    link.feed('1.0E+07\n'); // the late reply
    slow = false;
    expect(session.isOutOfStep).toBe(false); // count paid off: no resync needed
    expect(await session.query('MEAS:VOLT?')).toBe('2.5');
    expect(link.written).toEqual(['READ?', 'MEAS:VOLT?']);
    expect(session.stats).toMatchObject({ staleLines: 1, resyncs: 0, timeouts: 1 });
  });

  it('resyncs with *OPC? when the late reply comes after the next command was due', async () => {
    let late: string | null = '1.0E+07';
    const { session, clock, link } = setup((cmd, l) => {
      if (cmd === '*OPC?') {
        // The instrument finishes the slow query first, then answers *OPC?.
        if (late !== null) l.feed(`${late}\n`);
        late = null;
        l.feed('1\n');
      }
      if (cmd === 'MEAS:VOLT?') l.feed('2.5\n');
    });
    await session.open();
    const first = settle(session.query('READ?', { timeoutS: 0.5 }));
    await clock.advance(0.6);
    expect((await first).error).toBeInstanceOf(TimeoutError);
    const second = session.query('MEAS:VOLT?');
    await clock.advance(0.06); // quiet window after the sync reply
    expect(await second).toBe('2.5');
    expect(link.written).toEqual(['READ?', '*OPC?', 'MEAS:VOLT?']);
    expect(session.stats).toMatchObject({ resyncs: 1, staleLines: 1 });
  });

  it('is not fooled when the late reply is itself "1" (the quiet window catches the real *OPC? answer)', async () => {
    const { session, clock } = setup((cmd, l) => {
      if (cmd === 'OUTP?') return; // never answered in time
      if (cmd === '*OPC?') l.feed('1\n1\n', [2]); // late "1" then the real one
      if (cmd === 'MEAS:CURR?') l.feed('0.0125\n');
    });
    await session.open();
    const first = settle(session.query('OUTP?', { timeoutS: 0.2 }));
    await clock.advance(0.3);
    expect((await first).error).toBeInstanceOf(TimeoutError);
    const second = settle(session.query('MEAS:CURR?'));
    await clock.advance(0.1);
    expect((await second).value).toBe('0.0125');
    expect(session.stats.staleLines).toBe(1);
  });

  it('resyncs after an unsolicited extra line instead of handing it to the next query', async () => {
    const { session, clock, link } = setup((cmd, l) => {
      if (cmd === 'MEAS:VOLT?') l.feed('1.5\n');
      if (cmd === '*OPC?') l.feed('1\n');
    });
    await session.open();
    expect(await session.query('MEAS:VOLT?')).toBe('1.5');
    link.feed('junk\n');
    expect(session.isOutOfStep).toBe(true);
    const next = session.query('MEAS:VOLT?');
    await clock.advance(0.1);
    expect(await next).toBe('1.5');
    expect(link.written).toEqual(['MEAS:VOLT?', '*OPC?', 'MEAS:VOLT?']);
  });

  it('fails the operation with TimeoutError when even the resync gets no answer', async () => {
    const { session, clock } = setup(() => undefined, { defaultTimeoutS: 1 });
    await session.open();
    const first = settle(session.query('READ?'));
    await clock.advance(1.1);
    expect((await first).error).toBeInstanceOf(TimeoutError);
    const second = settle(session.query('READ?'));
    await clock.advance(1.1);
    const outcome = await second;
    expect(outcome.error).toBeInstanceOf(TimeoutError);
    expect((outcome.error as TimeoutError).command).toBe('*OPC?');
    expect(session.isOutOfStep).toBe(true);
  });

  it('drains SYST:ERR? after writes into a typed InstrumentError (SCPI-99: -222 Data out of range, -113 Undefined header)', async () => {
    const queue = ['-222,"Data out of range"', '-113,"Undefined header"'];
    const { session, link } = setup(
      (cmd, l) => {
        if (cmd === 'SYST:ERR?') l.feed(`${queue.shift() ?? '+0,"No error"'}\n`);
      },
      { checkErrorsAfterWrite: true },
    );
    await session.open();
    const outcome = await settle(session.write('SOUR:VOLT 99'));
    expect(outcome.error).toBeInstanceOf(InstrumentError);
    const error = outcome.error as InstrumentError;
    expect(error.code).toBe(-222);
    expect(error.entries).toEqual([
      { code: -222, message: 'Data out of range' },
      { code: -113, message: 'Undefined header' },
    ]);
    expect(error.command).toBe('SOUR:VOLT 99');
    expect(link.written).toEqual(['SOUR:VOLT 99', 'SYST:ERR?', 'SYST:ERR?', 'SYST:ERR?']);
    await session.write('SOUR:VOLT 1'); // queue now empty: no error
    await session.write('OUTP ON', { checkErrors: false });
    expect(link.written.slice(4)).toEqual(['SOUR:VOLT 1', 'SYST:ERR?', 'OUTP ON']);
    await expect(session.checkErrors()).resolves.toBeUndefined();
  });

  it('stops draining an error queue that never reports 0', async () => {
    const { session, link } = setup(
      (cmd, l) => {
        if (cmd === 'SYST:ERR?') l.feed('-350,"Queue overflow"\n');
      },
      { maxErrorEntries: 4 },
    );
    await session.open();
    const entries = await session.drainErrors();
    expect(entries.filter((e) => e.code === -350)).toHaveLength(4);
    expect(link.written).toHaveLength(4);
  });

  it('rejects garbage where a number is due with ReplyFormatError, and keeps working', async () => {
    const replies = ['', 'OVLD', '1.5\t', '9.91E37'];
    const { session } = setup((_cmd, l) => l.feed(`${replies.shift() ?? ''}\n`));
    await session.open();
    await expect(session.queryNumeric('MEAS:VOLT?')).rejects.toBeInstanceOf(ReplyFormatError);
    await expect(session.queryNumeric('MEAS:VOLT?')).rejects.toBeInstanceOf(ReplyFormatError);
    expect(await session.queryNumeric('MEAS:VOLT?')).toEqual({ kind: 'finite', value: 1.5 });
    expect(await session.queryNumeric('MEAS:FREQ?')).toEqual({ kind: 'not-a-number' });
  });

  it('reports a dropped link as DisconnectedError and reopens on the next call', async () => {
    const events: string[] = [];
    const { session, link } = setup(
      (cmd, l) => {
        if (cmd === 'MEAS:VOLT?') l.feed('3.3\n');
      },
      { onEvent: (event) => events.push(event.type) },
    );
    await session.open();
    const pending = settle(session.query('READ?'));
    await flushMicrotasks();
    link.feed('12'); // half a reply, then the cable goes
    link.drop();
    const outcome = await pending;
    expect(outcome.error).toBeInstanceOf(DisconnectedError);
    expect((outcome.error as DisconnectedError).disconnected).toBe(true);
    expect(await session.query('MEAS:VOLT?')).toBe('3.3'); // partial "12" was forgotten
    expect(link.opens).toBe(2);
    expect(session.stats.reconnects).toBe(1);
    expect(events).toEqual(['disconnected', 'reconnected']);
  });

  it('gives up reopening after the bounded number of attempts, waiting on the clock between them', async () => {
    const { session, link, clock } = setup((_c, l) => l.feed('1\n'), { reconnect: { attempts: 3, delayS: 1 } });
    await session.open();
    link.drop();
    link.failOpens = 5;
    const outcome = settle(session.query('*OPC?'));
    await clock.advance(0.5);
    expect(link.failOpens).toBe(4); // first try at once; the second waits 1 s, the third 2 s more
    await clock.advance(3);
    const result = await outcome;
    expect(result.error).toBeInstanceOf(DisconnectedError);
    expect(String((result.error as Error).message)).toMatch(/3 attempt/);
    expect(link.failOpens).toBe(2);
    link.failOpens = 0;
    await session.reconnect();
    expect(await session.query('*OPC?')).toBe('1');
  });

  it('never reopens on its own when attempts is 0', async () => {
    const { session, link } = setup((_c, l) => l.feed('1\n'), { reconnect: { attempts: 0, delayS: 1 } });
    await session.open();
    link.drop();
    await expect(session.query('*OPC?')).rejects.toBeInstanceOf(DisconnectedError);
    expect(link.opens).toBe(1);
  });

  it('fails queued operations when closed, and refuses use before open', async () => {
    const { session, clock } = setup(() => undefined);
    await expect(session.query('*IDN?')).rejects.toBeInstanceOf(DisconnectedError);
    await session.open();
    const a = settle(session.query('READ?'));
    const b = settle(session.query('READ?'));
    await flushMicrotasks();
    await session.close();
    expect((await a).error).toBeInstanceOf(DisconnectedError);
    expect((await b).error).toBeInstanceOf(DisconnectedError);
    expect(clock.pendingTimers).toBe(0);
  });

  it('passes arbitrary blocks through as bytes and runs the common commands', async () => {
    const payload = Buffer.from([0x0a, 0x00, 0xfe, 0x0a]);
    const { session, link } = setup((cmd, l) => {
      if (cmd === 'TRAC:DATA?') l.feed(Buffer.concat([Buffer.from('#14'), payload, Buffer.from('\n')]), [3, 5]);
      if (cmd === '*OPC?') l.feed('1\n');
    });
    await session.open();
    const bytes = await session.queryBytes('TRAC:DATA?');
    expect(Array.from(bytes)).toEqual([0x23, 0x31, 0x34, 0x0a, 0x00, 0xfe, 0x0a]);
    await session.reset();
    await session.clearStatus();
    await session.waitComplete();
    expect(link.written).toEqual(['TRAC:DATA?', '*RST', '*CLS', '*OPC?']);
  });

  it('names the bad option', () => {
    const link = new ScriptedTransport();
    expect(() => new ScpiSession({ transport: link, clock: new FakeClock(), defaultTimeoutS: 0 })).toThrow(
      /defaultTimeoutS/,
    );
  });

  it('applies a short timeout on time even right after a long one (one lazily re-armed timer)', async () => {
    const { session, clock } = setup((cmd, l) => {
      if (cmd === 'SLOW?') l.feed('7\n');
    });
    await session.open();
    expect(await session.query('SLOW?', { timeoutS: 100 })).toBe('7');
    const quick = settle(session.query('NEVER?', { timeoutS: 0.5 }));
    await clock.advance(0.49);
    expect(session.stats.timeouts).toBe(0);
    await clock.advance(0.02);
    expect((await quick).error).toBeInstanceOf(TimeoutError);
    expect(clock.now()).toBeLessThan(1);
  });

  it('returns every reply intact for random replies cut at random byte offsets (property)', async () => {
    const reply = fc.oneof(
      fc.double({ noNaN: true, noDefaultInfinity: true }).map((x) => x.toExponential().toUpperCase()),
      fc.string({ unit: fc.constantFrom(...'abcXYZ019,."°µ✓ '.split('')), maxLength: 20 }),
    );
    await fc.assert(
      fc.asyncProperty(
        fc.array(reply, { minLength: 1, maxLength: 6 }),
        fc.array(fc.nat(200), { maxLength: 6 }),
        fc.boolean(),
        async (replies, cuts, crlf) => {
          const queue = [...replies];
          const { session } = setup((_cmd, l) => l.feed(`${queue.shift() ?? ''}${crlf ? '\r\n' : '\n'}`, cuts));
          await session.open();
          const got = await Promise.all(replies.map((_, i) => session.query(`Q${i}?`)));
          expect(got).toEqual(replies);
        },
      ),
      { numRuns: 150 },
    );
  });

  it('runs an exclusive sequence without other callers slipping in between', async () => {
    const { session, link } = setup((cmd, l) => {
      if (cmd.endsWith('?')) setImmediate(() => l.feed(`${cmd.toLowerCase()}\n`));
    });
    await session.open();
    const sequence = session.exclusive(async (io) => {
      await io.send('VOLT 1');
      return [await io.ask('A?'), await io.ask('B?')];
    });
    const other = session.query('C?');
    expect(await sequence).toEqual(['a?', 'b?']);
    expect(await other).toBe('c?');
    expect(link.written).toEqual(['VOLT 1', 'A?', 'B?', 'C?']);
  });
});

describe('ScpiSession resync with a fresh *ESE token (issue 15 item 3)', () => {
  function tokenSetup(responder: Responder, random: () => number) {
    const clock = new FakeClock();
    const link = new ScriptedTransport(responder);
    const session = new ScpiSession({ transport: link, clock, random });
    return { clock, link, session };
  }

  it('drops late replies — "1" included, which fooled *OPC? — until the token comes back, with no quiet window', async () => {
    let owed: string[] = ['1', '+8.620000E+03']; // a late *OPC? answer and a late reading, both still in the pipe
    const { session, clock, link } = tokenSetup(
      (cmd, l) => {
        const m = /^\*ESE (\d+);\*ESE\?$/.exec(cmd);
        if (m) {
          l.feed(`${owed.join('\n')}\n${m[1]}\n`);
          owed = [];
        }
        if (cmd === 'READ?') l.feed('+7.250000E+03\n');
      },
      () => 0.5,
    );
    await session.open();
    const first = settle(session.query('OUTP?', { timeoutS: 0.2 }));
    await clock.advance(0.3);
    expect((await first).error).toBeInstanceOf(TimeoutError);
    // With *OPC? the stray "1" ended the resync and the 8620 Hz line became this reply.
    expect(await session.query('READ?')).toBe('+7.250000E+03');
    expect(link.written).toEqual(['OUTP?', '*ESE 128;*ESE?', 'READ?']);
    expect(session.stats).toMatchObject({ resyncs: 1, staleLines: 2 });
  });

  it('never reuses the previous token, and fails with TimeoutError naming the sync when nothing answers', async () => {
    const { session, clock, link } = tokenSetup(
      () => undefined,
      () => 0.2,
    );
    await session.open();
    const first = settle(session.query('READ?', { timeoutS: 0.5 }));
    await clock.advance(0.6);
    expect((await first).error).toBeInstanceOf(TimeoutError);
    const second = settle(session.query('READ?'));
    await clock.advance(2.1);
    expect(((await second).error as TimeoutError).command).toBe('*ESE 52;*ESE?');
    const third = settle(session.query('READ?'));
    await clock.advance(2.1);
    expect(((await third).error as TimeoutError).command).toBe('*ESE 53;*ESE?');
    expect(link.written.filter((c) => c.startsWith('*ESE'))).toEqual(['*ESE 52;*ESE?', '*ESE 53;*ESE?']);
  });

  it('sendUrgent writes at once while a query still waits for its reply', async () => {
    const { session, clock, link } = tokenSetup(
      () => undefined,
      () => 0.5,
    );
    await session.open();
    const pending = settle(session.query('MEAS:VOLT?', { timeoutS: 1 }));
    await session.sendUrgent('OUTP OFF');
    expect(link.written).toEqual(['MEAS:VOLT?', 'OUTP OFF']);
    await clock.advance(1.1);
    expect((await pending).error).toBeInstanceOf(TimeoutError);
  });
});
