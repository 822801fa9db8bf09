import { describe, expect, it } from 'vitest';
import { serveSimBench } from '../sim/tcp-server.ts';
import { RealClock } from '../time/real-clock.ts';
import { VirtualClock } from '../time/virtual-clock.ts';
import { openBench } from './open-bench.ts';

describe('openBench (the service over assembleBench)', () => {
  it('opens the simulated bench on the sim clock and reports every role as simulated', async () => {
    const realClock = new RealClock();
    const simClock = new VirtualClock({ autoAdvance: true });
    const bench = await openBench('sim', { clock: realClock, simClock: () => simClock });
    try {
      expect(bench.clock).toBe(simClock);
      expect(bench.connection).toMatchObject({ connected: true, simulated: true, error: null });
      expect(bench.connection.roles.map((r) => [r.role, r.simulated])).toEqual([
        ['supply', true],
        ['counter', true],
        ['thermometer', true],
      ]);
      expect(bench.connection.roles[1]?.idn).toMatch(/SIM-COUNTER/);
      expect(bench.roles.controlChannel).toBe(1);
      expect(bench.roles.dutSupplyChannel).toBe(2);
      // The relaxation DUT is powered (channel 2 on at power-on) but its tuning port is off: no oscillation yet.
      expect((await bench.roles.counter.readFrequency()).status).toBe('no-signal');
    } finally {
      await bench.close();
    }
  });

  it('keeps real time for a bench with real (here: TCP-served) instruments', async () => {
    const served = await serveSimBench({ basePort: 0, host: '127.0.0.1' });
    try {
      const realClock = new RealClock();
      const bench = await openBench(
        {
          supply: { address: served.addresses.supply, controlChannel: 1, dutSupplyChannel: 2 },
          counter: { address: served.addresses.counter },
        },
        { clock: realClock, simClock: () => new VirtualClock() },
      );
      expect(bench.clock).toBe(realClock);
      expect(bench.connection.simulated).toBe(false);
      expect(bench.connection.roles.map((r) => [r.role, r.address, r.simulated])).toEqual([
        ['supply', served.addresses.supply, false],
        ['counter', served.addresses.counter, false],
      ]);
      await bench.close();
    } finally {
      await served.close();
    }
  });
});
