/**
 * Speed of the virtual clock and the simulated bench: a 12-hour drift log at
 * 1 s intervals (43,200 iterations: a counter reading, a temperature reading
 * and a sleep each) over the in-process SCPI transport, auto-advanced with
 * VirtualClock.runUntil. Run: `npx tsx test/bench/sim-clock.ts`.
 */
import { performance } from 'node:perf_hooks';
import { LineClient } from '../../main/sim/line-client.ts';
import { createSimBench } from '../../main/sim/sim-bench.ts';
import { VirtualClock } from '../../main/time/virtual-clock.ts';

export async function runSimClockBench(): Promise<void> {
  // Bare clock: sleeps only.
  {
    const clock = new VirtualClock();
    const t0 = performance.now();
    await clock.runUntil(
      (async () => {
        for (let i = 0; i < 43_200; i++) {
          await clock.sleep(0.5);
          await clock.sleep(0.5);
        }
      })(),
    );
    console.log(
      `virtual clock: 12 h at 1 s (86,400 timers)            ${((performance.now() - t0) / 1000).toFixed(2)} s real`,
    );
  }
  // Whole simulated bench over SCPI.
  {
    const clock = new VirtualClock();
    const bench = createSimBench({ clock, dut: 'relaxation', seed: 1 });
    const supply = new LineClient(bench.transport('supply'));
    const counter = new LineClient(bench.transport('counter'));
    const thermo = new LineClient(bench.transport('thermometer'));
    await Promise.all([supply.transport.open(), counter.transport.open(), thermo.transport.open()]);
    const t0 = performance.now();
    let ok = 0;
    await clock.runUntil(
      (async () => {
        await supply.send('SOUR1:VOLT 3;:OUTP1 ON');
        await counter.send('FREQ:APER 0.1');
        for (let i = 0; i < 43_200; i++) {
          const start = clock.now();
          const hz = Number(await counter.query('MEAS:FREQ?'));
          await thermo.query('MEAS:TEMP?');
          if (hz > 0 && hz < 1e30) ok++;
          await clock.sleep(Math.max(0, start + 1 - clock.now()));
        }
      })(),
    );
    const realS = (performance.now() - t0) / 1000;
    console.log(
      `sim bench: 12 h drift log, 43,200 × (MEAS:FREQ? + MEAS:TEMP?)  ${realS.toFixed(2)} s real, ${ok} readings ok`,
    );
    bench.close();
  }
}

if (import.meta.url === `file://${process.argv[1]}`) await runSimClockBench();
