/**
 * The Web Serial transport against a port built on real ReadableStream /
 * WritableStream pairs whose far end is the simulated supply of `tunebench
 * sim` (served on 127.0.0.1, ephemeral port) through a byte bridge
 * (testing/fake-web-serial.ts). The SCPI session on top is the one every
 * other transport carries, so framing, timeouts and reopening are the
 * project's own; what is checked here is that this transport feeds them
 * exactly what the serial transport would.
 */
import { afterEach, describe, expect, it, vi } from 'vitest';
import { serveSimBench, type ServedSimBench } from '../sim/tcp-server.ts';
import { RealClock } from '../time/real-clock.ts';
import { DisconnectedError, TimeoutError } from './errors.ts';
import { ScpiSession } from './scpi-session.ts';
import { DRAIN_GRACE_S } from './serial-transport.ts';
import { FakeClock } from './testing/fake-clock.ts';
import { FakeSerialPort, FakeWebSerial, farEndOf, type FarEnd } from './testing/fake-web-serial.ts';
import type { WebSerialPortInfo } from './web-serial-types.ts';
import { WEB_SERIAL_DRAIN_GRACE_S, WebSerialTransport } from './web-serial-transport.ts';

const SUPPLY_USB: WebSerialPortInfo = { usbVendorId: 0x0403, usbProductId: 0x6001 };
const OTHER_USB: WebSerialPortInfo = { usbVendorId: 0x1a86, usbProductId: 0x7523 };
/** What a bench file holds for a supply on a USB adapter (the path means nothing to a page). */
const BENCH_ADDRESS = 'serial:/dev/ttyUSB0?baud=115200';
const SIM_SUPPLY_IDN = 'tunebench,SIM-SUPPLY,0,0.1';

let served: ServedSimBench | null = null;
const sessions: ScpiSession[] = [];
afterEach(async () => {
  for (const s of sessions.splice(0)) await s.close().catch(() => undefined);
  await served?.close();
  served = null;
});

async function simSupply(): Promise<FarEnd> {
  served = await serveSimBench({ host: '127.0.0.1', basePort: 0, seed: 5, clock: new RealClock() });
  return farEndOf(served.addresses.supply);
}

interface Rig {
  serial: FakeWebSerial;
  port: FakeSerialPort;
  transport: WebSerialTransport;
  session: ScpiSession;
  closes: (Error | null)[];
}

async function rig(options: { chunkBytes?: number; open?: boolean } = {}): Promise<Rig> {
  const far = await simSupply();
  const serial = new FakeWebSerial();
  const port = new FakeSerialPort({ far, info: SUPPLY_USB, chunkBytes: options.chunkBytes });
  serial.ports.push(port);
  const transport = new WebSerialTransport({ port, serial, address: BENCH_ADDRESS, role: 'supply' });
  const closes: (Error | null)[] = [];
  transport.on('close', (reason) => closes.push(reason));
  const session = new ScpiSession({
    transport,
    clock: new RealClock(),
    defaultTimeoutS: 1,
    reconnect: { attempts: 2, delayS: 0.05 },
  });
  sessions.push(session);
  if (options.open !== false) await session.open();
  return { serial, port, transport, session, closes };
}

describe('WebSerialTransport against tunebench sim through a byte bridge', () => {
  it('opens with the bench file line settings and names the port by its USB ids', async () => {
    const { port, transport, session } = await rig();
    expect(port.opens).toEqual([
      { baudRate: 115200, dataBits: 8, parity: 'none', stopBits: 1, flowControl: 'none', bufferSize: 4096 },
    ]);
    expect(transport.address).toBe('serial:usb-0403-6001?baud=115200&databits=8&parity=none&stopbits=1&flow=none');
    expect((await session.identify()).idn).toBe(SIM_SUPPLY_IDN);
  });

  it('frames replies split at every byte, and at every other chunk size, into the same lines', async () => {
    const replies: string[][] = [];
    for (const chunkBytes of [1, 2, 3, 7, 64]) {
      const { port, session } = await rig({ chunkBytes });
      const got = [await session.query('*IDN?')];
      await session.write('INST:NSEL 1;:SOUR:VOLT 1.5');
      got.push(await session.query('INST:NSEL 1;:SOUR:VOLT?'));
      await session.write('NOT:A:COMMAND 1');
      got.push(await session.query('SYST:ERR?'));
      got.push(await session.query('SYST:ERR?'));
      // Every reply byte (terminators included) went through one read of its chunk size.
      const bytes = got.reduce((sum, line) => sum + line.length + 1, 0);
      if (chunkBytes === 1) expect(port.chunksDelivered).toBe(bytes);
      else expect(port.chunksDelivered).toBeGreaterThanOrEqual(Math.ceil(bytes / chunkBytes));
      replies.push(got);
      await session.close();
      await served?.close();
      served = null;
    }
    expect(replies[0]?.[0]).toBe(SIM_SUPPLY_IDN);
    expect(Number(replies[0]?.[1])).toBe(1.5);
    expect(replies[0]?.[2]).toBe('-113,"Undefined header"');
    expect(replies[0]?.[3]).toBe('0,"No error"');
    for (const got of replies) expect(got).toEqual(replies[0]);
  });

  it('a non-fatal line error (parity) loses bytes, not the link', async () => {
    const { port, transport, session, closes } = await rig();
    port.lineError();
    expect(await session.query('*IDN?')).toBe(SIM_SUPPLY_IDN);
    expect(transport.isOpen).toBe(true);
    expect(closes).toEqual([]);
  });

  it('a query the instrument never answers times out on the session clock; the link stays in step', async () => {
    const { port, session } = await rig({ chunkBytes: 1 });
    // The simulated supply answers an unknown query with silence and an error-queue entry.
    await expect(session.query('SYST:NOSUCH?', { timeoutS: 0.2 })).rejects.toBeInstanceOf(TimeoutError);
    expect(await session.query('*IDN?')).toBe(SIM_SUPPLY_IDN);
    // A line that went quiet times out too, and the next query after it is answered in step.
    port.mute = true;
    await expect(session.query('INST:NSEL 1;:SOUR:VOLT?', { timeoutS: 0.2 })).rejects.toBeInstanceOf(TimeoutError);
    port.mute = false;
    expect(await session.query('*IDN?')).toBe(SIM_SUPPLY_IDN);
    expect((await session.drainErrors()).map((e) => e.code)).toEqual([-113]);
  });

  it('close lets a write still queued reach the instrument', async () => {
    const { transport, closes } = await rig();
    const write = transport.write('INST:NSEL 1;:SOUR:VOLT 2.25\n');
    await transport.close();
    await write;
    await vi.waitFor(() => expect(served?.bench.supply.state(1).setpointV).toBe(2.25));
    expect(transport.isOpen).toBe(false);
    expect(closes).toEqual([null]);
  });

  it('close does not hang on a write held off by flow control: after the grace it aborts and closes', async () => {
    expect(WEB_SERIAL_DRAIN_GRACE_S).toBe(DRAIN_GRACE_S);
    const far = await simSupply();
    const serial = new FakeWebSerial();
    const port = new FakeSerialPort({ far, info: SUPPLY_USB });
    const clock = new FakeClock();
    const transport = new WebSerialTransport({ port, serial, address: BENCH_ADDRESS, clock });
    await transport.open();
    port.holdWrites = true;
    const write = transport.write('INST:NSEL 1;:OUTP OFF\n');
    const writeOutcome = write.then(
      () => 'written',
      (error: unknown) => error,
    );
    let closed = false;
    const closing = transport.close().then(() => {
      closed = true;
    });
    await clock.advance(WEB_SERIAL_DRAIN_GRACE_S * 0.9);
    expect(closed).toBe(false);
    await clock.advance(WEB_SERIAL_DRAIN_GRACE_S * 0.2);
    await closing;
    expect(closed).toBe(true);
    expect(await writeOutcome).toBeInstanceOf(DisconnectedError);
    expect(port.readable).toBeNull();
    expect(port.writable).toBeNull();
  });

  it('a port that disappears mid-reply is a dropped link; the partial reply is never read as a line', async () => {
    const { serial, port, transport, session, closes } = await rig({ chunkBytes: 1 });
    port.cutNextReply(6);
    const lost = await session.query('*IDN?').catch((error: unknown) => error);
    expect(lost).toBeInstanceOf(DisconnectedError);
    expect((lost as DisconnectedError).message).toMatch(
      /link to serial:usb-0403-6001.* lost: The device has been lost/,
    );
    expect(transport.isOpen).toBe(false);
    expect(closes).toHaveLength(1);
    expect(closes[0]?.message).toBe('The device has been lost.');
    // Nothing plugged back in: reopening fails and says why.
    const down = await session.query('*IDN?').catch((error: unknown) => error);
    expect(down).toBeInstanceOf(DisconnectedError);
    expect((down as Error).message).toMatch(/no port with USB 0403:6001 is plugged in/);
    // The adapter comes back (a new port object, same ids): the session reopens on it and reads whole lines.
    const back = new FakeSerialPort({ far: farEndOf(served?.addresses.supply ?? ''), info: SUPPLY_USB, chunkBytes: 1 });
    serial.ports.push(back);
    expect(await session.query('*IDN?')).toBe(SIM_SUPPLY_IDN);
    expect(back.opens).toHaveLength(1);
  });

  it("the 'disconnect' event alone drops the link, and the same port is reopened once it is free", async () => {
    const { port, transport, session, closes } = await rig();
    port.emitDisconnect();
    expect(transport.isOpen).toBe(false);
    expect(closes[0]?.message).toMatch(/disconnected/);
    await session.reconnect();
    expect(port.opens).toHaveLength(2);
    expect(await session.query('*IDN?')).toBe(SIM_SUPPLY_IDN);
  });

  it('reconnects through getPorts() to the port with the same USB vendor/product ids, never to another', async () => {
    const { serial, port, session } = await rig();
    const far = farEndOf(served?.addresses.supply ?? '');
    // Another adapter, granted and free, listed first: it must not be taken for the supply.
    const other = new FakeSerialPort({ far, info: OTHER_USB });
    serial.ports.unshift(other);
    port.unplug();
    await vi.waitFor(() => expect(sessions[0]?.transport.isOpen).toBe(false));
    await expect(session.reconnect()).rejects.toThrow(/no port with USB 0403:6001 is plugged in/);
    expect(other.opens).toHaveLength(0);

    const replugged = new FakeSerialPort({ far, info: SUPPLY_USB });
    serial.ports.push(replugged);
    await session.reconnect();
    expect(replugged.opens).toHaveLength(1);
    expect(other.opens).toHaveLength(0);
    expect(await session.query('*IDN?')).toBe(SIM_SUPPLY_IDN);
  });

  it('refuses to guess between two ports with the same ids', async () => {
    const { serial, port, session } = await rig();
    const far = farEndOf(served?.addresses.supply ?? '');
    port.unplug();
    serial.ports.push(new FakeSerialPort({ far, info: SUPPLY_USB }), new FakeSerialPort({ far, info: SUPPLY_USB }));
    await expect(session.reconnect()).rejects.toThrow(/2 allowed ports have USB 0403:6001 and cannot be told apart/);
  });

  it('two opens at once make one attempt on the port', async () => {
    const { port, transport } = await rig({ open: false });
    await Promise.all([transport.open(), transport.open()]);
    expect(port.opens).toHaveLength(1);
    expect(transport.isOpen).toBe(true);
    await transport.close();
  });

  it('a port the page cannot open is "cannot open", not a lost link', async () => {
    const { port, session } = await rig({ open: false });
    await port.open({ baudRate: 9600 }); // held by someone else
    const error = await session.open().catch((e: unknown) => e);
    expect(error).toBeInstanceOf(DisconnectedError);
    expect((error as DisconnectedError).opening).toBe(true);
    expect((error as Error).message).toMatch(/^cannot open serial:usb-0403-6001.*already open/);
    await port.close();
  });

  it('opens from the address alone when its path names USB ids (serial:usb-VVVV-PPPP)', async () => {
    const far = await simSupply();
    const serial = new FakeWebSerial();
    serial.ports.push(new FakeSerialPort({ far, info: OTHER_USB }), new FakeSerialPort({ far, info: SUPPLY_USB }));
    const transport = new WebSerialTransport({ serial, address: 'serial:usb-0403-6001?baud=9600&parity=even' });
    const session = new ScpiSession({ transport, clock: new RealClock(), defaultTimeoutS: 1 });
    sessions.push(session);
    await session.open();
    expect(serial.ports[1]?.opens[0]).toMatchObject({ baudRate: 9600, parity: 'even' });
    expect(serial.ports[0]?.opens).toHaveLength(0);
    expect(await session.query('*IDN?')).toBe(SIM_SUPPLY_IDN);
  });
});
