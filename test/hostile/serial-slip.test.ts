/**
 * A counter whose replies slip one query late, reached over a serial line
 * (issue 15 item 3 over serial, not only TCP): a socat pty stands for the
 * serial adapter and carries the bytes to the misbehaving proxy in front of
 * the simulated counter. A real `tunebench sweep`; the supply's real state is
 * read from the simulator. Probed this session: both held (the serial line
 * frames with the readline parser, so this is a path the TCP tests miss).
 */
import { spawn, type ChildProcess } from 'node:child_process';
import { existsSync } from 'node:fs';
import { readFile, writeFile } from 'node:fs/promises';
import { join } from 'node:path';
import { afterEach, describe, expect, it } from 'vitest';
import { coreOf } from '../../main/sim/dut-model.ts';
import { runCliCaptured } from '../testing/run-cli-captured.ts';
import { misbehave } from '../testing/scpi-proxy.ts';
import { SHORT_SWEEP, hostileBench, runEvents, type HostileBench } from './hostile-bench.ts';

const SOCAT = '/usr/bin/socat';
const hasSocat = existsSync(SOCAT);

let bench: HostileBench | null = null;
let socat: ChildProcess | null = null;
afterEach(async () => {
  socat?.kill('SIGTERM');
  socat = null;
  await bench?.close();
  bench = null;
});

/** A pty at `path` whose bytes socat carries to and from the proxy's TCP port (a serial adapter stand-in). */
async function serialToProxy(path: string, port: number): Promise<ChildProcess> {
  const child = spawn(SOCAT, [`pty,raw,echo=0,link=${path}`, `tcp:127.0.0.1:${port}`], { stdio: 'ignore' });
  for (let i = 0; i < 200 && !existsSync(path); i++) await new Promise((r) => setTimeout(r, 20));
  return child;
}

/** The bench file's counter moved to a pty bridged to its proxy, then a short `tunebench sweep` on it. */
async function sweepOverSerial(b: HostileBench): ReturnType<typeof runCliCaptured> {
  const pty = join(b.dir, 'counter-tty');
  socat = await serialToProxy(pty, b.counterProxy.port);
  const file = JSON.parse(await readFile(b.benchFile, 'utf8')) as { counter: { address: string } };
  file.counter.address = `serial:${pty}?baud=115200`;
  await writeFile(b.benchFile, JSON.stringify(file));
  return runCliCaptured('sweep', '--bench', b.benchFile, '--plan', await b.planFile(SHORT_SWEEP), '--runs', b.runsDir);
}

describe.skipIf(!hasSocat)('a counter slipping one query late over serial (socat pty)', () => {
  it(
    'records no value: every reading is an error, the run is a counter fault, exit 1, the supply safe',
    { timeout: 90_000 },
    async () => {
      const b = await hostileBench({ counter: misbehave.slipOneQuery(/^READ\?$/) });
      bench = b;
      const cli = await sweepOverSerial(b);
      const runDir = cli.out.split('\n')[0] ?? '';
      const csv = (await readFile(join(runDir, 'samples.csv'), 'utf8')).trim().split('\n');
      const status = (csv[0] as string).split(',').indexOf('status');
      const frequency = (csv[0] as string).split(',').indexOf('frequency_hz');
      const rows = csv.slice(1).map((line) => line.split(','));
      expect(rows).toHaveLength(3);
      // No slipped answer (an *ESE echo, the previous point's reading) is kept as a frequency.
      expect(rows.map((row) => [row[status], row[frequency]])).toEqual([
        ['error', ''],
        ['error', ''],
        ['error', ''],
      ]);
      const events = await runEvents(runDir);
      expect(events.filter((e) => e.type === 'fault' && e.errorName === 'AlignmentError')).toHaveLength(3);
      expect(cli.err).toMatch(/counter-fault/);
      expect(cli.err).toMatch(/serial:\S+counter-tty/);
      expect(cli.code).toBe(1);
      expect(b.served.bench.snapshot().supply[0]).toMatchObject({ outputOn: false, setpointV: 0 });
    },
  );

  it(
    'one reading that comes late over serial is dropped at the resync and taken again: every point matches the DUT',
    { timeout: 90_000 },
    async () => {
      let readings = 0;
      const b = await hostileBench({
        counter: {
          reply: (line, ctx) => {
            if (ctx.lastCommand !== 'READ?') return `${line}\n`;
            readings += 1;
            // The second reading slips past gate + margin (0.05 + 0.3 s) of the fast profile.
            return readings === 2 ? { text: `${line}\n`, afterS: 0.6 } : `${line}\n`;
          },
        },
      });
      bench = b;
      const cli = await sweepOverSerial(b);
      expect(cli.code, cli.err).toBe(0);
      const runDir = cli.out.split('\n')[0] ?? '';
      const csv = (await readFile(join(runDir, 'samples.csv'), 'utf8')).trim().split('\n');
      const header = (csv[0] as string).split(',');
      const rows = csv.slice(1).map((line) => line.split(','));
      expect(rows).toHaveLength(3);
      for (const row of rows) {
        expect(row[header.indexOf('status')]).toBe('ok');
        const truth = coreOf(b.served.bench.dutParams, Number(row[header.indexOf('control_v')]), 5).frequencyHz;
        // Within 0.5 % of the model (tempco, warm-up and noise are ~0.1 %); the points are > 10 % apart.
        expect(Math.abs(Number(row[header.indexOf('frequency_hz')]) / truth - 1)).toBeLessThan(0.005);
      }
      const events = await runEvents(runDir);
      expect(events.some((e) => e.type === 'link' && e.role === 'counter' && e.event === 'resync')).toBe(true);
      expect(b.served.bench.snapshot().supply[0]).toMatchObject({ outputOn: false, setpointV: 0 });
    },
  );
});
