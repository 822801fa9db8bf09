import { spawn, type ChildProcess } from 'node:child_process';
import { existsSync } from 'node:fs';
import { mkdtemp, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { PassThrough, Duplex } from 'node:stream';
import { afterAll, describe, expect, it } from 'vitest';
import { RealClock } from '../time/real-clock.ts';
import { createSimBench } from './sim-bench.ts';
import { attachDeviceToStream, serveDeviceOnSerial } from './stream-adapter.ts';

function duplexPair(): { host: Duplex; device: Duplex } {
  const toDevice = new PassThrough();
  const toHost = new PassThrough();
  const device = Duplex.from({ readable: toDevice, writable: toHost });
  const host = Duplex.from({ readable: toHost, writable: toDevice });
  return { host, device };
}

function nextLine(stream: NodeJS.ReadableStream): Promise<string> {
  return new Promise((resolve) => {
    let text = '';
    const onData = (chunk: Buffer | string): void => {
      text += chunk.toString();
      const nl = text.indexOf('\n');
      if (nl >= 0) {
        stream.off('data', onData);
        resolve(text.slice(0, nl));
      }
    };
    stream.on('data', onData);
  });
}

describe('stream adapter', () => {
  it('serves a device over a plain duplex stream', async () => {
    const bench = createSimBench({ clock: new RealClock() });
    const { host, device } = duplexPair();
    const detach = attachDeviceToStream(bench.thermometer.device, device);
    const reply = nextLine(host);
    host.write('*IDN?\n');
    expect(await reply).toBe('tunebench,SIM-THERMOMETER,0,0.1');
    detach();
    bench.close();
  });
});

describe('device on a serial pty pair (socat)', () => {
  let socat: ChildProcess | null = null;
  let dir = '';
  afterAll(async () => {
    if (socat?.pid !== undefined) socat.kill('SIGTERM');
    if (dir) await rm(dir, { recursive: true, force: true });
  });

  it('answers *IDN? and a reading through the pty', async () => {
    dir = await mkdtemp(join(tmpdir(), 'tunebench-pty-'));
    const devicePath = join(dir, 'device');
    const hostPath = join(dir, 'host');
    socat = spawn('/usr/bin/socat', [`pty,raw,echo=0,link=${devicePath}`, `pty,raw,echo=0,link=${hostPath}`], {
      stdio: 'ignore',
    });
    for (let i = 0; i < 100 && !(existsSync(devicePath) && existsSync(hostPath)); i++)
      await new Promise((r) => setTimeout(r, 20));
    const bench = createSimBench({ clock: new RealClock(), seed: 8 });
    const served = await serveDeviceOnSerial(bench.counter.device, { path: devicePath, baudRate: 115200 });
    const { SerialPort } = await import('serialport');
    const port = new SerialPort({ path: hostPath, baudRate: 115200 });
    await new Promise<void>((resolve, reject) => port.once('open', resolve).once('error', reject));
    try {
      let reply = nextLine(port);
      port.write('*IDN?\n');
      expect(await reply).toBe('tunebench,SIM-COUNTER,0,0.1');
      reply = nextLine(port);
      port.write('FREQ:APER 0.01;:MEAS:FREQ?\n');
      expect(await reply).toBe('+9.91000000000000E+37'); // channel 1 off: stalled
    } finally {
      await new Promise<void>((resolve) => port.close(() => resolve()));
      await served.close();
      bench.close();
    }
  });
});
