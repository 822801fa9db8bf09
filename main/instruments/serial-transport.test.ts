import { spawn, type ChildProcess } from 'node:child_process';
import { existsSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { SerialPort } from 'serialport';
import { openSync, closeSync, writeSync } from 'node:fs';
import { afterEach, describe, expect, it, vi } from 'vitest';
import { VirtualClock } from '../time/virtual-clock.ts';
import { RealClock } from '../time/real-clock.ts';
import { createTransport } from './create-transport.ts';
import { DisconnectedError, InstrumentError } from './errors.ts';
import { ScpiSession } from './scpi-session.ts';
import { DRAIN_GRACE_S, listSerialPorts, SerialTransport } from './serial-transport.ts';
import { RESPONDER_IDN, ScpiResponder } from './testing/scpi-responder.ts';

const SOCAT = '/usr/bin/socat';
const haveSocat = existsSync(SOCAT);

interface PtyPair {
  dir: string;
  a: string;
  b: string;
  socat: ChildProcess;
}

const cleanups: (() => Promise<void> | void)[] = [];
afterEach(async () => {
  for (const cleanup of cleanups.splice(0).reverse()) await cleanup();
});

/** A linked pty pair from socat in a fresh temp dir (one per test). */
async function ptyPair(): Promise<PtyPair> {
  const dir = mkdtempSync(path.join(tmpdir(), 'tunebench-pty-'));
  const a = path.join(dir, 'a');
  const b = path.join(dir, 'b');
  const socat = spawn(SOCAT, ['-d', '-d', `pty,raw,echo=0,link=${a}`, `pty,raw,echo=0,link=${b}`], { stdio: 'ignore' });
  cleanups.push(() => {
    socat.kill('SIGTERM');
    rmSync(dir, { recursive: true, force: true });
  });
  for (let i = 0; i < 100 && !(existsSync(a) && existsSync(b)); i += 1) await new Promise((r) => setTimeout(r, 50));
  if (!existsSync(a) || !existsSync(b)) throw new Error('socat did not create the pty pair');
  return { dir, a, b, socat };
}

/** The instrument end: a ScpiResponder on one pty, opened with serialport itself. */
async function serveResponder(devicePath: string): Promise<ScpiResponder> {
  const responder = new ScpiResponder();
  const port = new SerialPort({ path: devicePath, baudRate: 115200, autoOpen: false });
  await new Promise<void>((resolve, reject) => port.open((error) => (error ? reject(error) : resolve())));
  cleanups.push(() => new Promise<void>((resolve) => (port.isOpen ? port.close(() => resolve()) : resolve())));
  let pending = '';
  port.on('data', (chunk: Buffer) => {
    pending += chunk.toString('utf8');
    for (let nl = pending.indexOf('\n'); nl !== -1; nl = pending.indexOf('\n')) {
      const line = pending.slice(0, nl);
      pending = pending.slice(nl + 1);
      responder.handle(line, {
        // Reply in two pieces with a pause between, so the framer sees a split line.
        reply: (text) => {
          const bytes = Buffer.from(`${text}\r\n`);
          port.write(bytes.subarray(0, 3));
          setTimeout(() => port.write(bytes.subarray(3)), 5);
        },
        hangUp: () => port.close(),
      });
    }
  });
  return responder;
}

describe.skipIf(!haveSocat)('SerialTransport over a socat pty pair', () => {
  it('runs *IDN?, setpoints and the error queue through serialport', async () => {
    const pair = await ptyPair();
    const responder = await serveResponder(pair.a);
    const transport = createTransport(`serial:${pair.b}?baud=115200&parity=none&stopbits=1&flow=none`);
    const session = new ScpiSession({ transport, clock: new RealClock(), checkErrorsAfterWrite: true });
    cleanups.push(() => session.close());
    await session.open();
    expect((await session.identify()).idn).toBe(RESPONDER_IDN);
    await session.write('INST:NSEL 1;:SOUR:VOLT 1.75');
    expect(await session.queryNumeric('MEAS:VOLT?')).toEqual({ kind: 'finite', value: 1.75 });
    const error = await session.write('SOUR:VOLX 1').catch((e: unknown) => e);
    expect(error).toBeInstanceOf(InstrumentError);
    expect((error as InstrumentError).code).toBe(-113);
    expect(responder.received).toBeGreaterThanOrEqual(6);
  });

  it('closes after a grace time when pending output cannot drain (peer sent XOFF), issue 10 item 4', async () => {
    const pair = await ptyPair();
    const clock = new VirtualClock();
    const transport = new SerialTransport({ path: pair.b, baudRate: 9600, flow: 'xon', clock });
    await transport.open();
    // The far end says "stop sending" (XOFF, 0x13): the tty holds our output and drain never completes.
    const far = openSync(pair.a, 'r+');
    cleanups.push(() => closeSync(far));
    writeSync(far, Buffer.from([0x13]));
    await new Promise((r) => setTimeout(r, 100));
    const pendingWrite = transport.write('X'.repeat(200_000)).catch((e: unknown) => e);
    let closed = false;
    const closing = transport.close().then(() => (closed = true));
    await new Promise((r) => setTimeout(r, 300));
    expect(closed).toBe(false); // still draining: the old code waited here for ever
    await clock.advance(DRAIN_GRACE_S);
    await closing;
    expect(closed).toBe(true);
    expect(await pendingWrite).toBeInstanceOf(DisconnectedError);
  });

  it('opens with the VISA ASRL form and reports a vanished port as DisconnectedError', async () => {
    const pair = await ptyPair();
    await serveResponder(pair.a);
    const session = new ScpiSession({
      transport: createTransport(`ASRL${pair.b}::INSTR`),
      clock: new RealClock(),
      reconnect: { attempts: 1, delayS: 0.05 },
    });
    cleanups.push(() => session.close());
    await session.open();
    expect((await session.identify()).serial).toBe('T0001');
    pair.socat.kill('SIGTERM');
    await new Promise((r) => setTimeout(r, 200));
    const error = await session.query('*IDN?', { timeoutS: 0.5 }).catch((e: unknown) => e);
    expect(error).toBeInstanceOf(DisconnectedError);
  });
  it('frames replies cut across reads through the readline parser: CR LF, UTF-8, a block holding newlines (issue 10 item 8)', async () => {
    const pair = await ptyPair();
    const transport = new SerialTransport({ path: pair.b, baudRate: 115200 });
    const lines: string[] = [];
    const bytesSeen: number[] = [];
    transport.on('data', (chunk) => bytesSeen.push(chunk.length));
    const off = transport.onLines('\n', (line) => lines.push(line.toString('latin1')));
    cleanups.push(() => transport.close());
    await transport.open();
    const far = openSync(pair.a, 'r+');
    cleanups.push(() => closeSync(far));
    // Each piece is written alone and given time to arrive as its own read: the cuts fall inside a
    // number, between CR and LF, inside the two bytes of "°" (C2 B0) and inside a block's payload.
    const block = Buffer.from('#211ab\ncd\r\nef\n#', 'latin1');
    const pieces = [
      Buffer.from('+1.2'),
      Buffer.from('5E+03\r'),
      Buffer.from('\n23.5 \xc2', 'latin1'),
      Buffer.from('\xb0C\r\n', 'latin1'),
      block.subarray(0, 9),
      block.subarray(9),
      Buffer.from('\r\n0\n'),
    ];
    for (const piece of pieces) {
      writeSync(far, piece);
      await new Promise((r) => setTimeout(r, 30));
    }
    // The pieces came as several reads (a loaded machine may merge neighbours, never all of them).
    expect(bytesSeen.length).toBeGreaterThan(1);
    expect(lines).toEqual(['+1.25E+03', '23.5 \xc2\xb0C', block.toString('latin1'), '0']);
    off();
    writeSync(far, Buffer.from('after\n'));
    await new Promise((r) => setTimeout(r, 30));
    expect(lines).toHaveLength(4);
  });

  it('opens with flow control and framing options set (XON/XOFF, 7E2; RTS/CTS) and still talks', async () => {
    const pair = await ptyPair();
    await serveResponder(pair.a);
    for (const options of ['flow=xon&parity=even&databits=7&stopbits=2', 'flow=rtscts']) {
      const session = new ScpiSession({
        transport: createTransport(`serial:${pair.b}?baud=19200&${options}`),
        clock: new RealClock(),
      });
      await session.open();
      expect((await session.identify()).idn).toBe(RESPONDER_IDN);
      await session.close();
    }
  });
});

describe('SerialTransport without a port', () => {
  it('fails to open a missing device with DisconnectedError naming the path', async () => {
    const transport = new SerialTransport({ path: '/nonexistent/tty-tunebench' });
    const error = await transport.open().catch((e: unknown) => e);
    expect(error).toBeInstanceOf(DisconnectedError);
    expect(String(error)).toContain('/nonexistent/tty-tunebench');
  });

  it('lists ports, and gives the reason instead of throwing when the system cannot enumerate', async () => {
    const list = vi.spyOn(SerialPort, 'list');
    try {
      list.mockResolvedValueOnce([
        {
          path: '/dev/ttyUSB0',
          manufacturer: 'acme',
          serialNumber: 'S1',
          pnpId: undefined,
          locationId: undefined,
          vendorId: '0403',
          productId: '6001',
        },
      ]);
      expect(await listSerialPorts()).toEqual({
        ports: [
          { path: '/dev/ttyUSB0', manufacturer: 'acme', serialNumber: 'S1', vendorId: '0403', productId: '6001' },
        ],
      });
      list.mockRejectedValueOnce(new Error('udevadm: not found'));
      expect(await listSerialPorts()).toEqual({ ports: [], error: 'udevadm: not found' });
    } finally {
      list.mockRestore();
    }
  });
});
