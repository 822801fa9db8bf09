/**
 * Raw-socket SCPI servers for the simulated instruments (port 5025 is the
 * trade's convention for raw SCPI). Loopback only by default.
 */
import { createServer, type Server, type Socket } from 'node:net';
import { RealClock } from '../time/real-clock.ts';
import type { Clock } from '../time/clock.ts';
import type { RoleName } from '../instruments/roles.ts';
import type { ScpiDevice } from './scpi-device.ts';
import { createSimBench, type SimBench, type SimBenchOptions } from './sim-bench.ts';
import { attachDeviceToStream } from './stream-adapter.ts';

export interface ServedDevice {
  /** `tcp://HOST:PORT` */
  address: string;
  host: string;
  port: number;
  close(): Promise<void>;
}

export async function serveDevice(
  device: ScpiDevice,
  options: { host?: string; port?: number } = {},
): Promise<ServedDevice> {
  const host = options.host ?? '127.0.0.1';
  const sockets = new Set<Socket>();
  const server: Server = createServer({ allowHalfOpen: true }, (socket) => {
    socket.setNoDelay(true);
    sockets.add(socket);
    const detach = attachDeviceToStream(device, socket);
    socket.on('close', () => {
      sockets.delete(socket);
      detach();
    });
  });
  await new Promise<void>((resolve, reject) => {
    server.once('error', reject);
    server.listen(options.port ?? 5025, host, () => {
      server.off('error', reject);
      resolve();
    });
  });
  const addressInfo = server.address();
  const port = typeof addressInfo === 'object' && addressInfo ? addressInfo.port : (options.port ?? 5025);
  return {
    address: `tcp://${host}:${port}`,
    host,
    port,
    close: () =>
      new Promise<void>((resolve) => {
        for (const socket of sockets) socket.destroy();
        server.close(() => resolve());
      }),
  };
}

export interface ServeSimBenchOptions extends Omit<SimBenchOptions, 'clock'> {
  clock?: Clock;
  host?: string;
  /** Supply on basePort, counter on basePort+1, thermometer on basePort+2, chamber on basePort+3. 0: four ephemeral ports. */
  basePort?: number;
}

export interface ServedSimBench {
  bench: SimBench;
  addresses: Record<RoleName, string>;
  close(): Promise<void>;
}

export async function serveSimBench(options: ServeSimBenchOptions = {}): Promise<ServedSimBench> {
  const bench = createSimBench({ ...options, clock: options.clock ?? new RealClock() });
  const basePort = options.basePort ?? 5025;
  const roles: RoleName[] = ['supply', 'counter', 'thermometer', 'chamber'];
  const served: ServedDevice[] = [];
  try {
    for (const [i, role] of roles.entries()) {
      served.push(
        await serveDevice(bench.devices[role], { host: options.host, port: basePort === 0 ? 0 : basePort + i }),
      );
    }
  } catch (error) {
    await Promise.all(served.map((s) => s.close()));
    bench.close();
    throw error;
  }
  const [supply, counter, thermometer, chamber] = served as [ServedDevice, ServedDevice, ServedDevice, ServedDevice];
  return {
    bench,
    addresses: {
      supply: supply.address,
      counter: counter.address,
      thermometer: thermometer.address,
      chamber: chamber.address,
    },
    async close() {
      bench.close();
      await Promise.all(served.map((s) => s.close()));
    },
  };
}
