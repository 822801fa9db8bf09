/**
 * Probes of a campaign's own safe state (issue 15 items 1–2 carried to
 * campaigns): a real `tunebench campaign` process on the simulated bench
 * served on TCP (chamber and thermometer included), the supply behind the
 * misbehaving proxy, real time. Two Ctrl-C arrive while the campaign's safe
 * state runs on a supply whose replies have wedged for good. Found by the
 * probe: the DUT supply's OUTP OFF never went out — it waited in the
 * session's queue behind a resync the wedged link could not answer — and the
 * DUT stayed powered at 5 V. The campaign's supply steps are now one
 * verified safe state: every command written urgently first, then read back.
 * Also found: SIGHUP (the terminal or SSH session closing on an overnight
 * campaign) killed the process outright, the control channel left on at
 * 2.5 V, the DUT powered and the chamber running; the campaign now has the
 * recording commands' last-resort guard (main/cli/run-setup.ts cliControl).
 * The supply's real state is read from the simulator.
 */
import { spawn } from 'node:child_process';
import { readdir, readFile } from 'node:fs/promises';
import { readCampaignFile } from '../../main/procedures/campaign/campaign-file.ts';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { afterEach, describe, expect, it } from 'vitest';
import { misbehave } from '../testing/scpi-proxy.ts';
import { SHORT_SWEEP, hostileBench, interruptTwiceWhen, type HostileBench } from './hostile-bench.ts';

const LAUNCHER = fileURLToPath(new URL('../../main/bin/tunebench.mjs', import.meta.url));

let bench: HostileBench | null = null;
afterEach(async () => {
  await bench?.close();
  bench = null;
});

/** One unit, one temperature at the simulated lab's ambient (23 °C), one supply corner: a few seconds. */
const CAMPAIGN = {
  temperaturesC: [23],
  supplyV: [5],
  maxSupplyV: 5.5,
  units: ['probe-unit'],
  soak: { toleranceC: 1.5, maxSlopeCPerMin: 5, dwellS: 2, timeoutS: 60, readIntervalS: 0.25 },
  chamber: { minC: -20, maxC: 70, maxRateCPerMin: 3 },
  sweep: SHORT_SWEEP,
  safeC: 21,
  nominalControlV: 2.5,
};

/** A real `tunebench campaign` on the hostile bench: the child, its stderr so far, and its exit (code, signal). */
async function startCampaign(b: HostileBench) {
  const plan = await b.planFile(CAMPAIGN);
  const child = spawn(
    process.execPath,
    [LAUNCHER, 'campaign', '--bench', b.benchFile, '--plan', plan, '--runs', b.runsDir],
    {
      stdio: ['ignore', 'pipe', 'pipe'],
    },
  );
  let err = '';
  child.stderr.on('data', (chunk: Buffer) => (err += chunk.toString()));
  child.stdout.resume();
  const exited = new Promise<[number | null, string | null]>((resolve) =>
    child.on('close', (code, signal) => resolve([code, signal])),
  );
  return { child, stderr: () => err, exited };
}

describe("a campaign's own safe state", () => {
  it(
    'two Ctrl-C while it runs on a wedged supply: both outputs off and 0 V on the bench, exit 1 with the warning',
    { timeout: 90_000 },
    async () => {
      // The sweep's own safe state writes VOLT 0 first; the second VOLT 0 opens the campaign's. From there on
      // the supply's replies stop ending, on every connection.
      let volt0 = 0;
      let wedged = false;
      const wedge = misbehave.unterminatedReplies();
      const b = await hostileBench(
        {
          supply: {
            command: (line) => {
              if (line === 'INST:NSEL 1;:SOUR:VOLT 0' && ++volt0 === 2) wedged = true;
              return line;
            },
            reply: (line, ctx) => (wedged && wedge.reply ? wedge.reply(line, ctx) : `${line}\n`),
          },
        },
        { campaign: true },
      );
      bench = b;
      const { child, stderr, exited } = await startCampaign(b);
      const { sent, stop } = interruptTwiceWhen(
        child,
        () => wedged,
        () => b.supplyProxy.log.length,
      );
      const [code] = await exited;
      const err = stderr();
      stop();
      expect(sent).toHaveLength(2);
      expect(code, err).toBe(1);
      // The campaign's warning, or the last-resort guard's when the second Ctrl-C handed it the exit.
      expect(err).toMatch(/the safe state could not be confirmed on every step/);
      // What the bench really did: the commands went out ahead of any readback, and it obeyed them.
      const [control, dutSupply] = b.served.bench.snapshot().supply;
      expect(control).toMatchObject({ outputOn: false, setpointV: 0 });
      expect(dutSupply?.outputOn, 'DUT supply output').toBe(false);
      expect(b.served.bench.snapshot().chamber.setpointC).toBe(21);
      // The campaign's record says which steps it could not confirm; none claims a confirmation it lacks.
      // The one campaign folder (the guard may exit before the folder's path is printed).
      const dir = join(b.runsDir, (await readdir(b.runsDir))[0] ?? '');
      const events = (await readFile(join(dir, 'campaign-events.jsonl'), 'utf8'))
        .split('\n')
        .filter(Boolean)
        .map((line) => JSON.parse(line) as { type: string; step?: string; ok?: boolean; safe_state_ok?: boolean });
      const supplySteps = events.filter((e) => e.type === 'safe-state' && !/^chamber/.test(e.step ?? ''));
      expect(supplySteps.map((e) => [e.step, e.ok])).toEqual([
        ['control-voltage 0 V', false],
        ['output-off', false],
        ['dut-supply-off channel 2', false],
      ]);
      expect(events.find((e) => e.type === 'campaign-end')?.safe_state_ok).toBe(false);
    },
  );

  it(
    'SIGHUP mid-sweep (the terminal closed): a clean stop through the safe state, campaign.json aborted, exit 1',
    { timeout: 90_000 },
    async () => {
      let at25 = false;
      const b = await hostileBench(
        {
          supply: {
            command: (line) => {
              if (line === 'INST:NSEL 1;:SOUR:VOLT 2.5') at25 = true;
              return line;
            },
          },
        },
        { campaign: true },
      );
      bench = b;
      const { child, stderr, exited } = await startCampaign(b);
      const watch = setInterval(() => {
        if (!at25) return;
        clearInterval(watch);
        child.kill('SIGHUP');
      }, 5);
      const [code, signal] = await exited;
      const err = stderr();
      clearInterval(watch);
      expect(signal, err).toBeNull();
      expect(code, err).toBe(1);
      const [control, dutSupply] = b.served.bench.snapshot().supply;
      expect(control).toMatchObject({ outputOn: false, setpointV: 0 });
      expect(dutSupply?.outputOn, 'DUT supply output').toBe(false);
      expect(b.served.bench.snapshot().chamber.setpointC).toBe(21);
      const folder = /--resume (\S+)/.exec(err)?.[1] ?? '';
      const file = await readCampaignFile(folder);
      expect(file).toMatchObject({ status: 'aborted', reason: 'signal' });
      expect(file.conditions[0]?.state).toBe('waiting');
    },
  );
});
