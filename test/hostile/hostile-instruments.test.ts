/**
 * Instruments that lie or wedge (issue 15 items 1–5, issue 8 item 1): the
 * simulated bench on TCP behind a misbehaving proxy, driven through the
 * CLI. After each run the simulated supply's real state is read from the
 * simulator object, never through the proxy.
 */
import { readFile } from 'node:fs/promises';
import { join } from 'node:path';
import { afterEach, describe, expect, it } from 'vitest';
import { pushingPlanSchema } from '../../app/contract/plans.ts';
import { assembleBench } from '../../main/bench/assemble.ts';
import { loadBenchFile } from '../../main/cli/config-files.ts';
import { coreOf } from '../../main/sim/dut-model.ts';
import { runPushing } from '../../main/procedures/pushing.ts';
import { MemorySink } from '../../main/procedures/testing/fake-bench.ts';
import { RealClock } from '../../main/time/real-clock.ts';
import { runCliCaptured } from '../testing/run-cli-captured.ts';
import { misbehave, type ProxyContext } from '../testing/scpi-proxy.ts';
import { SHORT_SWEEP, hostileBench, runEvents, type HostileBench } from './hostile-bench.ts';

let bench: HostileBench | null = null;
afterEach(async () => {
  await bench?.close();
  bench = null;
});

async function sweep(b: HostileBench, plan: unknown = SHORT_SWEEP) {
  const cli = await runCliCaptured(
    'sweep',
    '--bench',
    b.benchFile,
    '--plan',
    await b.planFile(plan),
    '--runs',
    b.runsDir,
  );
  const runDir = cli.out.split('\n')[0] ?? '';
  return { ...cli, runDir, events: await runEvents(runDir) };
}

const controlChannel = (b: HostileBench) => b.served.bench.snapshot().supply[0];

describe('issue 15 item 1: the safe state is proven by readback', () => {
  it(
    'a supply that ignores OUTP OFF: ok:false, a warning naming the channel and what it read, exit 1',
    { timeout: 60_000 },
    async () => {
      bench = await hostileBench({ supply: misbehave.ignoreCommands(/:OUTP OFF$/) });
      const run = await sweep(bench);
      expect(run.code).toBe(1);
      expect(run.err).toMatch(/WARNING: the safe state could not be confirmed/);
      expect(run.err).toMatch(/channel 1 output-off not confirmed after 3 readback\(s\): read back ON/);
      const step = run.events.find((e) => e.type === 'safe-state' && e.step === 'output-off');
      expect(step).toMatchObject({ ok: false, channel: 1, read: 'ON', attempts: 3 });
      // The truth, from the simulator: the output really is still on — and the run said so.
      expect(controlChannel(bench).outputOn).toBe(true);
      expect(
        bench.supplyProxy.log.filter((l) => l.direction === 'command' && /:OUTP OFF$/.test(l.line)).length,
      ).toBeGreaterThanOrEqual(3);
    },
  );

  it('a supply that ignores VOLT 0: the setpoint read back (3 V) is named, exit 1', { timeout: 60_000 }, async () => {
    bench = await hostileBench({ supply: misbehave.ignoreCommands(/^INST:NSEL 1;:SOUR:VOLT 0$/) });
    const run = await sweep(bench);
    expect(run.code).toBe(1);
    expect(run.err).toMatch(/channel 1 control-voltage 0 V not confirmed after 3 readback\(s\): read back 3 V/);
    expect(controlChannel(bench).setpointV).toBe(3);
    // The output-off step did its job and was confirmed.
    expect(controlChannel(bench).outputOn).toBe(false);
    expect(run.events.find((e) => e.type === 'safe-state' && e.step === 'output-off')).toMatchObject({
      ok: true,
      read: 'OFF',
    });
  });
});

describe('issue 15 item 2: a wedged supply link still gets the safe state', () => {
  /** From the write of 2.5 V on, the supply's replies on connection `only` (or every connection) stop ending. */
  function wedgeAfter25(only?: number) {
    let wedged = false;
    const wedge = misbehave.unterminatedReplies(only);
    return {
      command: (line: string) => {
        if (line === 'INST:NSEL 1;:SOUR:VOLT 2.5') wedged = true;
        return line;
      },
      reply: (line: string, ctx: ProxyContext) => (wedged && wedge.reply ? wedge.reply(line, ctx) : `${line}\n`),
    };
  }

  it(
    'writes VOLT 0 / OUTP OFF first on the wedged link, reconnects, writes again and confirms',
    { timeout: 60_000 },
    async () => {
      bench = await hostileBench({ supply: wedgeAfter25(1) });
      const run = await sweep(bench);
      expect(run.code).toBe(1); // the sweep itself failed on the wedged link
      expect(run.err).not.toMatch(/WARNING: the safe state/);
      const truth = controlChannel(bench);
      expect(truth).toMatchObject({ outputOn: false, setpointV: 0 });
      // The commands went out on the wedged connection before any verification…
      const onFirst = bench.supplyProxy.log
        .filter((l) => l.direction === 'command' && l.connection === 1)
        .map((l) => l.line);
      const at25 = onFirst.indexOf('INST:NSEL 1;:SOUR:VOLT 2.5');
      expect(onFirst.slice(at25)).toEqual(
        expect.arrayContaining(['INST:NSEL 1;:SOUR:VOLT 0', 'INST:NSEL 1;:OUTP OFF']),
      );
      // …then a fresh connection wrote them again and read them back.
      expect(bench.supplyProxy.connections).toBe(2);
      const safe = run.events.filter((e) => e.type === 'safe-state');
      expect(safe.map((e) => [e.step, e.ok, e.afterReconnect])).toEqual([
        ['control-voltage 0 V', true, true],
        ['output-off', true, true],
      ]);
    },
  );

  it(
    'a link wedged for good: the commands still reach the supply, the run says it could not confirm them',
    { timeout: 60_000 },
    async () => {
      bench = await hostileBench({ supply: wedgeAfter25() });
      const run = await sweep(bench);
      expect(run.code).toBe(1);
      expect(run.err).toMatch(/channel 1 control-voltage 0 V not confirmed/);
      expect(run.err).toMatch(/channel 1 output-off not confirmed/);
      expect(controlChannel(bench)).toMatchObject({ outputOn: false, setpointV: 0 });
    },
  );
});

describe('issue 15 item 3: a counter reply that comes late is never recorded as the next reading', () => {
  it(
    'the late reading is dropped at the *ESE resync and the point re-read; every point matches the DUT',
    { timeout: 60_000 },
    async () => {
      let frequencyReplies = 0;
      bench = await hostileBench({
        counter: {
          reply: (line, ctx) => {
            if (ctx.lastCommand !== 'READ?') return `${line}\n`;
            frequencyReplies += 1;
            // The second reading slips past gate + margin (0.05 + 0.3 s).
            return frequencyReplies === 2 ? { text: `${line}\n`, afterS: 0.6 } : `${line}\n`;
          },
        },
      });
      const run = await sweep(bench);
      expect(run.code).toBe(0);
      const csv = (await readFile(join(run.runDir, 'samples.csv'), 'utf8')).trim().split('\n');
      const header = (csv[0] as string).split(',');
      const rows = csv.slice(1).map((line) => line.split(','));
      const col = (name: string) => header.indexOf(name);
      expect(rows).toHaveLength(3);
      for (const row of rows) {
        expect(row[col('status')]).toBe('ok');
        const volts = Number(row[col('control_v')]);
        const truth = coreOf(bench.served.bench.dutParams, volts, 5).frequencyHz;
        // Within 0.5 % of the model (tempco, warm-up and noise are ~0.1 %); the points are > 10 % apart.
        expect(Math.abs(Number(row[col('frequency_hz')]) / truth - 1)).toBeLessThan(0.005);
      }
      expect(run.events.some((e) => e.type === 'link' && e.role === 'counter' && e.event === 'resync')).toBe(true);
      expect(
        bench.counterProxy.log.filter((l) => l.direction === 'command' && /^\*ESE \d+;\*ESE\?$/.test(l.line)),
      ).toHaveLength(1);
    },
  );
});

describe('issue 15 item 3: a counter whose every reply slips one query late', () => {
  it(
    'records no value at all — every reading is an error (alignment unproven) and the run is a counter fault',
    { timeout: 60_000 },
    async () => {
      bench = await hostileBench({ counter: misbehave.slipOneQuery(/^READ\?$/) });
      const run = await sweep(bench);
      expect(run.code).toBe(1);
      const csv = (await readFile(join(run.runDir, 'samples.csv'), 'utf8')).trim().split('\n');
      const status = (csv[0] as string).split(',').indexOf('status');
      const statuses = csv.slice(1).map((line) => line.split(',')[status]);
      expect(statuses.length).toBeGreaterThan(0);
      // Issue 15 reports that with the *OPC? resync a slipped "1" or the previous point's reading was recorded as ok.
      expect(statuses.every((s) => s === 'error')).toBe(true);
      expect(run.events.filter((e) => e.type === 'fault' && e.errorName === 'AlignmentError').length).toBe(
        statuses.length,
      );
      expect(run.err).toMatch(/counter-fault/);
      expect(controlChannel(bench)).toMatchObject({ outputOn: false, setpointV: 0 });
    },
  );
});

describe('issue 15 items 4 and 5: absurd values are faults, and a faulty counter is not a stalled DUT', () => {
  it(
    'counter 1e308 and supply MEAS:VOLT? 1e308: error readings, null conditions, a counter-fault run, exit 1',
    { timeout: 60_000 },
    async () => {
      bench = await hostileBench({
        counter: misbehave.answer(/^READ\?$/, '1e308'),
        supply: misbehave.answer(/MEAS:VOLT\?$/, '1e308'),
      });
      const run = await sweep(bench);
      expect(run.code).toBe(1);
      expect(run.err).toMatch(
        /sweep failed \(counter-fault\): all 3 readings failed on the counter at tcp:\/\/127\.0\.0\.1:\d+ .*not a stalled DUT/,
      );
      expect(run.out).toMatch(/no analysis: all 3 readings failed/);
      expect(run.out).not.toMatch(/oscillator stalled|stalled over/);
      const meta = JSON.parse(await readFile(join(run.runDir, 'run.json'), 'utf8')) as {
        status: string;
        conditions?: { dutSupplyV: { start: number | null } };
      };
      expect(meta.status).toBe('aborted');
      expect(meta.conditions?.dutSupplyV.start ?? null).toBeNull();
      const faults = run.events.filter((e) => e.type === 'fault');
      expect(faults.filter((e) => e.role === 'counter' && /maxInputHz/.test(String(e.error)))).toHaveLength(3);
      expect(faults.some((e) => e.role === 'supply' && /ratings\.maxVoltageV/.test(String(e.error)))).toBe(true);
      expect(controlChannel(bench)).toMatchObject({ outputOn: false, setpointV: 0 });
    },
  );

  it(
    'a garbled counter (every reply garbage) ends as a counter fault too, never "stalled"',
    { timeout: 60_000 },
    async () => {
      bench = await hostileBench({ counter: misbehave.answer(/^READ\?$/, '#garbage') });
      const run = await sweep(bench);
      expect(run.code).toBe(1);
      expect(run.err).toMatch(/counter-fault/);
      expect(run.out).not.toMatch(/oscillator stalled|stalled over/);
    },
  );
});

describe("issue 8 item 1: the supply driver refuses a write above a channel's own limit", () => {
  it('refuses the same channel for tuning port and DUT supply at load, naming both fields (exit 2)', async () => {
    bench = await hostileBench();
    const file = await bench.planFile(
      {
        supply: { address: bench.supplyProxy.address, controlChannel: 2 },
        counter: { address: bench.counterProxy.address },
      },
      'same.json',
    );
    await expect(loadBenchFile(file)).rejects.toThrow(
      /supply\.controlChannel and supply\.dutSupplyChannel: both are channel 2/,
    );
    const cli = await runCliCaptured('pushing', '--bench', file, '--runs', bench.runsDir);
    expect(cli.code).toBe(2);
    expect(cli.err).toMatch(/controlChannel and supply\.dutSupplyChannel/);
    expect(bench.supplyProxy.connections).toBe(0);
  });

  it(
    'pushing configured onto the control channel stops at maxControlV: nothing above 5 V reaches channel 1',
    { timeout: 60_000 },
    async () => {
      bench = await hostileBench();
      const clock = new RealClock();
      const assembled = await assembleBench(await loadBenchFile(bench.benchFile), { clock });
      // A bench built by some other path than the file loader: both roles on channel 1.
      assembled.dutSupplyChannel = assembled.controlChannel;
      const plan = pushingPlanSchema.parse({
        controlV: 1.5,
        supplyStartV: 4.5,
        supplyStopV: 5.5,
        supplyStepV: 0.5,
        maxSupplyV: 5.5,
        readingsPerPoint: 1,
        gateS: 0.05,
        settleS: 0.01,
        limits: { maxControlV: 5, currentLimitA: 0.02 },
      });
      const outcome = await runPushing({ bench: assembled, plan, clock, sink: new MemorySink() });
      await assembled.close();
      expect(outcome.failure?.kind).toBe('limits');
      expect(outcome.failure?.message).toMatch(
        /refused to set channel 1 to 5\.5 V, above its ceiling 5 V \(limits\.maxControlV\)/,
      );
      const written = bench.supplyProxy.log
        .filter((l) => l.direction === 'command')
        .map((l) => /^INST:NSEL 1;:SOUR:VOLT ([\d.eE+-]+)$/.exec(l.line)?.[1])
        .filter((v): v is string => v !== undefined)
        .map(Number);
      expect(written).toContain(5);
      expect(Math.max(...written)).toBe(5);
      expect(controlChannel(bench)).toMatchObject({ outputOn: false, setpointV: 0 });
    },
  );
});
