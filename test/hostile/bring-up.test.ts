/**
 * A real bench brought up safely (issue 8 items 5, 6, 8, 9, 10, 11): the
 * simulated bench on TCP behind a pass-through proxy that logs every line,
 * so a test can prove what was — and was not — written.
 */
import { createServer } from 'node:net';
import { readFile, writeFile } from 'node:fs/promises';
import { join } from 'node:path';
import { afterEach, describe, expect, it } from 'vitest';
import { runCliCaptured } from '../testing/run-cli-captured.ts';
import { misbehave } from '../testing/scpi-proxy.ts';
import { SHORT_SWEEP, hostileBench, runEvents, type HostileBench } from './hostile-bench.ts';

let bench: HostileBench | null = null;
afterEach(async () => {
  await bench?.close();
  bench = null;
});

/** A loopback port with nothing listening on it. */
async function closedPort(): Promise<number> {
  const server = createServer();
  await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', () => resolve()));
  const info = server.address();
  const port = typeof info === 'object' && info !== null ? info.port : 0;
  await new Promise<void>((resolve) => server.close(() => resolve()));
  return port;
}

async function benchWith(
  b: HostileBench,
  patch: (file: Record<string, Record<string, unknown>>) => void,
  name: string,
): Promise<string> {
  const file = JSON.parse(await readFile(b.benchFile, 'utf8')) as Record<string, Record<string, unknown>>;
  patch(file);
  const path = join(b.dir, name);
  await writeFile(path, JSON.stringify(file));
  return path;
}

const writesOf = (b: HostileBench) =>
  b.supplyProxy.log.filter(
    (l) => l.direction === 'command' && /(SOUR:VOLT |SOUR:CURR |OUTP (ON|OFF)|VOLT:PROT )/.test(l.line),
  );

describe('tunebench check (issue 8 item 11)', () => {
  it(
    'reports identity, error queue, channels, channel states and one reading per role; writes no setting',
    { timeout: 30_000 },
    async () => {
      bench = await hostileBench();
      const cli = await runCliCaptured('check', '--bench', bench.benchFile);
      expect(cli.code).toBe(0);
      const lines = cli.out.trim().split('\n');
      expect(lines[0]).toMatch(
        /^supply +PASS  tunebench,SIM-SUPPLY,0,0\.1 at tcp:\/\/127\.0\.0\.1:\d+ — error queue empty; 2 channel\(s\) in its profile; control channel 1: output off, setpoint 0 V; DUT supply channel 2: output ON, setpoint 5 V$/,
      );
      // Control channel off: the DUT's tuning port sits at 0 V, where it does not oscillate.
      expect(lines[1]).toMatch(
        /^counter +PASS  tunebench,SIM-COUNTER,0,0\.1 at tcp:\/\/.* — error queue empty; reading: no signal \(not-a-number\) — the counter answers/,
      );
      expect(lines.at(-1)).toBe('check: all 2 roles answer');
      expect(writesOf(bench)).toEqual([]);
      const truth = bench.served.bench.snapshot().supply;
      expect(truth[0]).toMatchObject({ outputOn: false, setpointV: 0 });
      expect(truth[1]).toMatchObject({ outputOn: true, setpointV: 5 });
    },
  );

  it(
    'a role that does not answer fails its own line (naming the address) and the exit code; the others still report',
    { timeout: 30_000 },
    async () => {
      bench = await hostileBench();
      const port = await closedPort();
      const file = await benchWith(
        bench,
        (f) => {
          (f.counter as Record<string, unknown>).address = `tcp://127.0.0.1:${port}`;
        },
        'dead-counter.json',
      );
      const cli = await runCliCaptured('check', '--bench', file);
      expect(cli.code).toBe(1);
      expect(cli.out).toMatch(/^supply +PASS/m);
      expect(cli.out).toMatch(
        new RegExp(
          `^counter +FAIL  \\(no identity\\) at tcp://127\\.0\\.0\\.1:${port} — counter: cannot open tcp://127\\.0\\.0\\.1:${port}: .*\\(nothing was sent\\)$`,
          'm',
        ),
      );
      expect(cli.out).not.toMatch(/lost/);
      expect(cli.out).toMatch(/check: counter failed/);
    },
  );
});

describe('bench checked before any write (issue 8 items 5 and 9)', () => {
  it('a control channel the profile does not have is refused at load (exit 2), before connecting', async () => {
    bench = await hostileBench();
    const file = await benchWith(
      bench,
      (f) => {
        (f.supply as Record<string, unknown>).controlChannel = 3;
      },
      'ch3.json',
    );
    const cli = await runCliCaptured(
      'sweep',
      '--bench',
      file,
      '--plan',
      await bench.planFile(SHORT_SWEEP),
      '--runs',
      bench.runsDir,
    );
    expect(cli.code).toBe(2);
    expect(cli.err).toMatch(/supply\.controlChannel: channel 3, but profile supply-fast has 2 channel\(s\) \(1\.\.2\)/);
    expect(bench.supplyProxy.log.filter((l) => l.direction === 'command')).toEqual([]);
  });

  it(
    'supply and counter addresses swapped: refused with the swap suggested, nothing written to either',
    { timeout: 30_000 },
    async () => {
      bench = await hostileBench();
      const b = bench;
      const file = await benchWith(
        b,
        (f) => {
          (f.supply as Record<string, unknown>).address = b.counterProxy.address;
          (f.counter as Record<string, unknown>).address = b.supplyProxy.address;
        },
        'swapped.json',
      );
      const cli = await runCliCaptured(
        'sweep',
        '--bench',
        file,
        '--plan',
        await b.planFile(SHORT_SWEEP),
        '--runs',
        b.runsDir,
      );
      expect(cli.code).toBe(2);
      expect(cli.err).toMatch(/the addresses look swapped: exchange counter\.address and supply\.address/);
      expect(cli.err).toMatch(/supply at tcp:\/\/127\.0\.0\.1:\d+ identifies as "tunebench,SIM-COUNTER,0,0\.1"/);
      expect(writesOf(b)).toEqual([]);
      expect(
        b.counterProxy.log.filter((l) => l.direction === 'command' && /SOUR|OUTP/.test(l.line) && !/\?$/.test(l.line)),
      ).toEqual([]);
      const check = await runCliCaptured('check', '--bench', file);
      expect(check.code).toBe(1);
      expect(check.out).toMatch(
        /^supply +FAIL  tunebench,SIM-COUNTER,0,0\.1 at .* — identifies as "tunebench,SIM-COUNTER,0,0\.1", which reads like a counter: are two addresses swapped\?$/m,
      );
      expect(check.out).toMatch(/^counter +FAIL  tunebench,SIM-SUPPLY/m);
    },
  );
});

describe('a control channel found on (issue 8 item 6) and identities printed (item 10)', () => {
  it(
    'found ON at 2.15 V: printed, recorded, driven safe before the limits are applied',
    { timeout: 60_000 },
    async () => {
      bench = await hostileBench();
      const clock = bench.served.bench.clock;
      bench.served.bench.supply.channels[0]?.apply({ setpointV: 2.15, outputOn: true }, clock.now());
      const cli = await runCliCaptured(
        'sweep',
        '--bench',
        bench.benchFile,
        '--plan',
        await bench.planFile(SHORT_SWEEP),
        '--runs',
        bench.runsDir,
      );
      expect(cli.code).toBe(0);
      expect(cli.err).toMatch(/^supply: tunebench,SIM-SUPPLY,0,0\.1 at tcp:\/\/127\.0\.0\.1:\d+$/m);
      expect(cli.err).toMatch(/^counter: tunebench,SIM-COUNTER,0,0\.1 at tcp:\/\/127\.0\.0\.1:\d+$/m);
      expect(cli.err).toMatch(/control channel 1 was found ON at 2\.15 V/);
      const events = await runEvents(cli.out.split('\n')[0] ?? '');
      const types = events.map((e) => e.type);
      expect(events.find((e) => e.type === 'found-output-on')).toMatchObject({ channel: 1, setpointV: 2.15 });
      const firstSafe = types.indexOf('safe-state');
      expect(firstSafe).toBeGreaterThan(types.indexOf('found-output-on'));
      expect(firstSafe).toBeLessThan(types.indexOf('limits'));
      // On the wire: output off before the current limit was set.
      const commands = writesOf(bench).map((l) => l.line);
      expect(commands.indexOf('INST:NSEL 1;:OUTP OFF')).toBeLessThan(
        commands.findIndex((c) => c.startsWith('INST:NSEL 1;:SOUR:CURR')),
      );
    },
  );
});

describe('connection errors name the role, the address and the last command (issue 8 item 8)', () => {
  it(
    'a silent supply: "supply at tcp://…: no reply to SYST:ERR? … (last command sent: SYST:ERR?)", never "lost"',
    { timeout: 30_000 },
    async () => {
      bench = await hostileBench({ supply: { reply: () => null } });
      const cli = await runCliCaptured(
        'sweep',
        '--bench',
        bench.benchFile,
        '--plan',
        await bench.planFile(SHORT_SWEEP),
        '--runs',
        bench.runsDir,
      );
      expect(cli.code).toBe(1);
      expect(cli.err).toMatch(
        new RegExp(
          `cannot open the bench: supply at ${bench.supplyProxy.address}: no reply to SYST:ERR\\? within 0\\.4 s \\(last command sent: SYST:ERR\\?\\)`,
        ),
      );
      expect(cli.err).not.toMatch(/lost/);
    },
  );

  it(
    'a serial port that cannot be opened: the OS error once, "cannot open", not "lost"',
    { timeout: 30_000 },
    async () => {
      bench = await hostileBench();
      const file = await benchWith(
        bench,
        (f) => {
          (f.counter as Record<string, unknown>).address = 'serial:/dev/tunebench-no-such-port';
        },
        'serial.json',
      );
      const cli = await runCliCaptured('check', '--bench', file);
      expect(cli.code).toBe(1);
      const line = cli.out.split('\n').find((l) => l.startsWith('counter')) ?? '';
      expect(line).toMatch(/counter: cannot open serial:\/dev\/tunebench-no-such-port\?baud=9600[^:]*: /);
      expect(line).not.toMatch(/lost/);
      expect(line.match(/No such file or directory/g)?.length ?? 0).toBeLessThanOrEqual(1);
    },
  );

  it('garbage instead of an identity still names the role and address', { timeout: 30_000 }, async () => {
    bench = await hostileBench({ counter: misbehave.answer(/^\*IDN\?$/, '') });
    const cli = await runCliCaptured('check', '--bench', bench.benchFile);
    expect(cli.code).toBe(1);
    expect(cli.out).toMatch(/^counter +FAIL/m);
  });
});
