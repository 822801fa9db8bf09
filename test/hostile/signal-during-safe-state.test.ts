/**
 * Ctrl-C pressed again while the safe state is being driven on a supply whose
 * link has wedged (issue 15 items 1–2, re-probed): the process may exit only
 * with the run's own verdict. Found by the re-probe: the second Ctrl-C went to
 * the last-resort guard, which took "the run ended" for "the bench is safe"
 * and exited 0 over the run's unconfirmed safe state. A real `tunebench sweep`
 * process (the guard is installed only when the command owns the process),
 * the simulated bench on TCP behind the proxy; the supply's real state read
 * from the simulator.
 */
import { spawn } from 'node:child_process';
import { fileURLToPath } from 'node:url';
import { afterEach, describe, expect, it } from 'vitest';
import { misbehave, type ProxyContext } from '../testing/scpi-proxy.ts';
import { SHORT_SWEEP, hostileBench, interruptTwiceWhen, runEvents, type HostileBench } from './hostile-bench.ts';

const LAUNCHER = fileURLToPath(new URL('../../main/bin/tunebench.mjs', import.meta.url));

let bench: HostileBench | null = null;
afterEach(async () => {
  await bench?.close();
  bench = null;
});

/** From the write of 2.5 V on, the supply's replies stop ending on every connection (a link wedged for good). */
function wedgedForGood() {
  let wedged = false;
  const wedge = misbehave.unterminatedReplies();
  return {
    command: (line: string) => {
      if (line === 'INST:NSEL 1;:SOUR:VOLT 2.5') wedged = true;
      return line;
    },
    reply: (line: string, ctx: ProxyContext) => (wedged && wedge.reply ? wedge.reply(line, ctx) : `${line}\n`),
  };
}

describe('Ctrl-C during the safe state', () => {
  it(
    'two Ctrl-C while the safe state runs on a wedged supply: the commands still go out, exit 1 with the warning',
    { timeout: 90_000 },
    async () => {
      const b = await hostileBench({ supply: wedgedForGood() });
      bench = b;
      const plan = await b.planFile(SHORT_SWEEP);
      const child = spawn(
        process.execPath,
        [LAUNCHER, 'sweep', '--bench', b.benchFile, '--plan', plan, '--runs', b.runsDir],
        { stdio: ['ignore', 'pipe', 'pipe'] },
      );
      let out = '';
      let err = '';
      child.stdout.on('data', (chunk: Buffer) => (out += chunk.toString()));
      child.stderr.on('data', (chunk: Buffer) => (err += chunk.toString()));
      const exited = new Promise<number | null>((resolve) => child.on('close', (code) => resolve(code)));
      // Both signals once the safe state's first command has reached the supply on the wedged connection.
      const { sent, stop } = interruptTwiceWhen(
        child,
        () =>
          b.supplyProxy.log.some(
            (l) => l.direction === 'command' && l.connection === 1 && l.line === 'INST:NSEL 1;:SOUR:VOLT 0',
          ),
        () => b.supplyProxy.log.length,
      );
      const code = await exited;
      stop();
      expect(sent).toHaveLength(2);
      // The run could not confirm its safe state, and says so — the exit code too.
      expect(err).toMatch(/channel 1 control-voltage 0 V not confirmed/);
      expect(code).toBe(1);
      const events = await runEvents(out.split('\n')[0] ?? '');
      expect(events.filter((e) => e.type === 'safe-state' && e.ok === false).length).toBeGreaterThan(0);
      // What the supply really did: the commands went out first on the wedged link, and it obeyed them.
      expect(b.served.bench.snapshot().supply[0]).toMatchObject({ outputOn: false, setpointV: 0 });
    },
  );
});
