import net from 'node:net';
import { afterEach, describe, expect, it } from 'vitest';
import { RealClock } from '../time/real-clock.ts';
import { createTransport } from './create-transport.ts';
import { DisconnectedError, InstrumentError, TimeoutError } from './errors.ts';
import { ScpiSession } from './scpi-session.ts';
import { TcpTransport } from './tcp-transport.ts';
import { RESPONDER_IDN, startTcpResponder, type TcpResponderServer } from './testing/scpi-responder.ts';

let server: TcpResponderServer | null = null;
afterEach(async () => {
  await server?.close();
  server = null;
});

async function freePort(): Promise<number> {
  const probe = net.createServer();
  await new Promise<void>((resolve) => probe.listen(0, '127.0.0.1', resolve));
  const address = probe.address();
  await new Promise<void>((resolve) => probe.close(() => resolve()));
  if (address === null || typeof address === 'string') throw new Error('no port');
  return address.port;
}

describe('TcpTransport on loopback', () => {
  it('carries a SCPI session: *IDN?, set and read back, error queue', async () => {
    server = await startTcpResponder();
    const transport = createTransport(`tcp://127.0.0.1:${server.port}`);
    expect(transport.address).toBe(`tcp://127.0.0.1:${server.port}`);
    const session = new ScpiSession({ transport, clock: new RealClock(), checkErrorsAfterWrite: true });
    await session.open();
    expect((await session.identify()).idn).toBe(RESPONDER_IDN);
    await session.write('INST:NSEL 2;:SOUR:VOLT 3.3');
    expect(await session.queryNumeric('INST:NSEL 2;:SOUR:VOLT?')).toEqual({ kind: 'finite', value: 3.3 });
    const failure = await session.write('SOUR:VOLT 99').catch((error: unknown) => error);
    expect(failure).toBeInstanceOf(InstrumentError);
    expect((failure as InstrumentError).code).toBe(-222);
    await session.close();
    expect(transport.isOpen).toBe(false);
  });

  it('times out a late reply and does not hand it to the next query', async () => {
    server = await startTcpResponder();
    const session = new ScpiSession({
      transport: new TcpTransport({ host: '127.0.0.1', port: server.port }),
      clock: new RealClock(),
    });
    await session.open();
    await expect(session.query('TEST:DELAY? 0.2', { timeoutS: 0.05 })).rejects.toBeInstanceOf(TimeoutError);
    // Sent while the late "+4.2E+00" is still on its way: the resync must eat it.
    expect(await session.queryNumeric('MEAS:VOLT?')).toEqual({ kind: 'finite', value: 1.2345 });
    expect(session.stats.staleLines).toBe(1);
    await session.close();
  });

  it('reports a refused connection as DisconnectedError', async () => {
    const port = await freePort();
    const session = new ScpiSession({
      transport: createTransport(`TCPIP0::127.0.0.1::${port}::SOCKET`),
      clock: new RealClock(),
    });
    const error = await session.open().catch((e: unknown) => e);
    expect(error).toBeInstanceOf(DisconnectedError);
    expect((error as DisconnectedError).disconnected).toBe(true);
  });

  it('turns a hang-up into DisconnectedError and reconnects on the next call', async () => {
    server = await startTcpResponder();
    const session = new ScpiSession({
      transport: createTransport(`tcp://127.0.0.1:${server.port}`),
      clock: new RealClock(),
    });
    await session.open();
    const error = await session.query('TEST:DROP').catch((e: unknown) => e);
    expect(error).toBeInstanceOf(DisconnectedError);
    expect((await session.identify()).model).toBe('Line Responder');
    expect(server.connections()).toBe(2);
    expect(session.stats.reconnects).toBe(1);
    await session.close();
  });

  it('delivers a write issued just before close (a final "output off" is not lost)', async () => {
    server = await startTcpResponder();
    const transport = new TcpTransport({ host: '127.0.0.1', port: server.port });
    await transport.open();
    void transport.write('INST:NSEL 2;:OUTP OFF\n');
    await transport.close();
    for (let i = 0; i < 100 && server.responder.received === 0; i += 1) await new Promise((r) => setTimeout(r, 10));
    expect(server.responder.received).toBe(1);
    expect(transport.isOpen).toBe(false);
    await expect(transport.write('*IDN?\n')).rejects.toBeInstanceOf(DisconnectedError);
  });

  it('names bad constructor options', () => {
    expect(() => new TcpTransport({ host: '' })).toThrow(/host/);
    expect(() => new TcpTransport({ host: '127.0.0.1', port: 70000 })).toThrow(/port/);
    expect(new TcpTransport({ host: '127.0.0.1' }).address).toBe('tcp://127.0.0.1:5025');
  });
});
