/**
 * `tunebench demo [--runs DIR] [--dut relaxation|varactor]` (`npm run demo`):
 * a full gain sweep of a built-in simulated DUT on the in-process simulated
 * bench, on a virtual clock so it takes seconds, then the gain table.
 */
import { mkdtemp } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { assembleBench } from '../bench/assemble.ts';
import { CAUTIONS, exitCodeFor, parseDutName } from './run-setup.ts';
import { defaultSweepPlan } from './default-plans.ts';
import { summarizeRun } from './run-summary.ts';
import { recordSweep } from '../procedures/recorded-run.ts';
import { VirtualClock } from '../time/virtual-clock.ts';
import { runCampaignDemo } from './demo-campaign-cli.ts';
import { parseFlags } from './flags.ts';
import { UsageError, type CliCommand } from './types.ts';

const usage = `usage: tunebench demo [--runs DIR] [--dut relaxation|varactor]
       tunebench demo campaign [--runs DIR]

Runs a full gain sweep of a built-in SIMULATED DUT on the in-process
simulated bench (virtual time, so it finishes in seconds), writes a run
folder (a new temporary folder unless --runs is given) and prints the gain
table. No instrument is touched.

\`demo campaign\` runs a short characterisation campaign instead: a simulated
chamber at −10, 25 and 60 °C, three DUT supply corners, one unit, then the
campaign datasheet (tempcos, Kvco per temperature, pushing, headroom).
`;

export const demoCommand: CliCommand = {
  name: 'demo',
  usage,
  async run(argv, io) {
    const flags = parseFlags(argv, { values: ['runs', 'dut'] });
    if (flags.positionals[0] === 'campaign' && flags.positionals.length === 1)
      return runCampaignDemo(flags.values.get('runs'), io);
    if (flags.positionals.length > 0)
      throw new UsageError(`unexpected argument "${flags.positionals[0]}" (expected nothing or "campaign")`);
    const dut = parseDutName(flags.values.get('dut'));
    const runsDir = flags.values.get('runs') ?? (await mkdtemp(join(tmpdir(), 'tunebench-demo-')));
    const clock = new VirtualClock({ autoAdvance: true, startWallIso: new Date().toISOString() });
    const bench = await assembleBench('sim', { clock, sim: { dut } });
    const plan = defaultSweepPlan(dut);
    const dutId = `sim-${bench.sim?.dutParams.id ?? dut}`;
    io.stderr.write(`${CAUTIONS}\n`);
    const scenario = (bench.sim?.dutParams.description ?? dut).split(/[:.]/)[0] ?? dut;
    io.stderr.write(`demo: SIMULATED bench and DUT (${scenario}); virtual time; no instrument is touched\n`);
    const startedMs = Date.now();
    try {
      const recorded = await recordSweep({ bench, plan, clock, runsDir, dutId });
      const o = recorded.outcome;
      io.stdout.write(`run folder: ${recorded.dir}\n`);
      io.stdout.write(
        `simulated sweep ${plan.start} … ${plan.stop} V in ${plan.step} V steps: ${o.pointsDone} points, ${o.refinedPoints} refined, ${o.rowsWritten} readings, ` +
          `${clock.now().toFixed(1)} s of bench time in ${((Date.now() - startedMs) / 1000).toFixed(1)} s\n\n`,
      );
      const summary = await summarizeRun(recorded.dir, `Gain table — ${dutId} (simulated)`);
      if (summary.tableMarkdown !== null) io.stdout.write(summary.tableMarkdown);
      io.stdout.write(`\n${summary.text}`);
      io.stdout.write(`\n${CAUTIONS}\n`);
      return exitCodeFor(o, io);
    } finally {
      await bench.close();
    }
  },
};
