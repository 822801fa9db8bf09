/**
 * `tunebench campaign --plan FILE [--bench FILE] [--runs DIR] [--resume DIR] [--real-time]`
 */
import { createInterface } from 'node:readline/promises';
import { renderCampaignMarkdown } from '../../app/analysis/campaign-datasheet.ts';
import { campaignPlanSchema, type CampaignPlan } from '../../app/contract/campaign-plan.ts';
import { describeIssues } from '../../app/contract/plans.ts';
import { assembleBench, SIM_CAMPAIGN_BENCH_CONFIG, type AssembledBench } from '../bench/assemble.ts';
import { asUsageError, CAUTIONS, cliControl, parseDutName, runsDirFrom } from './run-setup.ts';
import { ConfigFileError, loadBenchFile, loadCampaignPlan } from './config-files.ts';
import { AddressError, ProfileError } from '../instruments/errors.ts';
import { campaignSafeState } from '../procedures/campaign/campaign-safe.ts';
import { CampaignBusyError } from '../procedures/campaign/campaign-folder.ts';
import { readCampaignFile, CampaignFileError } from '../procedures/campaign/campaign-file.ts';
import {
  resumeCampaign,
  startCampaign,
  validateCampaign,
  type CampaignHooks,
  type CampaignOutcome,
} from '../procedures/campaign/run-campaign.ts';
import { LimitsError } from '../procedures/limits.ts';
import type { Clock } from '../time/clock.ts';
import { RealClock } from '../time/real-clock.ts';
import { VirtualClock } from '../time/virtual-clock.ts';
import { loadCampaignAnalysis } from './campaign-source.ts';
import { parseFlags } from './flags.ts';
import { UsageError, WorkFailedError, type CliCommand, type CliIo } from './types.ts';

export const CHAMBER_CAUTIONS = [
  'Chamber cautions: an unattended chamber runs for hours. Cold setpoints bring condensation and frost — let the',
  'chamber come back above the dew point before the door opens, and keep water off powered boards. Hot setpoints',
  "leave surfaces that burn. Keep door interlocks working and never bypass them. Your lab's rules and the chamber",
  "maker's instructions come first.",
].join('\n');

const usage = `usage: tunebench campaign --plan CAMPAIGN.json [--bench BENCH.json] [--runs DIR] [--real-time]
       tunebench campaign --resume CAMPAIGN_DIR [--bench BENCH.json] [--real-time]

Characterises the DUT over temperature, supply and units: for each unit,
each chamber temperature (soaked on the DUT thermometer) and each DUT supply
voltage, one gain sweep into an ordinary run folder inside a campaign folder
with campaign.json. Ends with the campaign datasheet.

options:
  --plan FILE       campaign plan: temperaturesC, supplyV, maxSupplyV, units, soak, chamber, sweep, safeC
  --bench FILE      bench file with a "chamber" and a "thermometer" entry; without it the built-in
                    simulated bench (with its chamber) runs in virtual time and finishes in seconds
  --runs DIR        where the campaign folder goes (default: TUNEBENCH_RUNS, else the user data folder)
  --resume DIR      carry on a campaign folder: finished conditions are kept, the rest done again
  --real-time       run the simulated bench on the wall clock
  --dut NAME        simulated DUT without --bench: relaxation (default) or varactor
  --seed N          seed of the simulated bench's noise (default 1)

Ctrl+C stops cleanly: supply outputs off, chamber to safeC (or stopped, per its profile).
`;

async function openBench(
  benchPath: string | undefined,
  dut: 'relaxation' | 'varactor',
  seed: number,
  clock: Clock,
): Promise<AssembledBench> {
  const config =
    benchPath === undefined ? SIM_CAMPAIGN_BENCH_CONFIG : await loadBenchFile(benchPath).catch(asUsageError);
  try {
    return await assembleBench(config, { clock, sim: { dut, seed } });
  } catch (error) {
    if (error instanceof AddressError || error instanceof ProfileError) asUsageError(error);
    throw new WorkFailedError(`cannot open the bench: ${error instanceof Error ? error.message : String(error)}`);
  }
}

/** The operator swaps the unit: Enter on a terminal; the simulated bench needs no hands. */
function unitChanger(io: CliIo, simulated: boolean): CampaignHooks['changeUnit'] {
  return async (from, next) => {
    io.stderr.write(
      `\nUNIT CHANGE: take out ${from}, put in ${next}. The DUT supply is off and the chamber is at its safe temperature.\n`,
    );
    if (simulated) {
      io.stderr.write('(simulated bench: the unit change is simulated)\n');
      return;
    }
    if (!process.stdin.isTTY)
      throw new WorkFailedError(
        `unit change ${from} → ${next} needs an operator at a terminal; resume with --resume when the unit is in`,
      );
    const rl = createInterface({ input: process.stdin, output: process.stderr });
    try {
      await rl.question(`Press Enter when ${next} is mounted and the door is closed… `);
    } finally {
      rl.close();
    }
  };
}

function parseSeed(text: string | undefined): number {
  if (text === undefined) return 1;
  if (!/^\d+$/.test(text)) throw new UsageError(`--seed "${text}": expected a non-negative integer`);
  return Number(text);
}

async function run(argv: string[], io: CliIo): Promise<number> {
  const flags = parseFlags(argv, {
    values: ['plan', 'bench', 'runs', 'resume', 'dut', 'seed'],
    booleans: ['real-time'],
  });
  if (flags.positionals.length > 0) throw new UsageError(`unexpected argument "${flags.positionals[0]}"`);
  const planPath = flags.values.get('plan');
  const resumeDir = flags.values.get('resume');
  if ((planPath === undefined) === (resumeDir === undefined))
    throw new UsageError('give --plan FILE for a new campaign or --resume DIR to carry one on');
  const dut = parseDutName(flags.values.get('dut'));
  const seed = parseSeed(flags.values.get('seed'));
  const planInput =
    planPath !== undefined
      ? await loadCampaignPlan(planPath).then(
          (loaded) => loaded.input,
          (error: unknown) => {
            throw error instanceof ConfigFileError ? new UsageError(error.message) : error;
          },
        )
      : await readCampaignFile(resumeDir as string).then(
          (f) => f.plan,
          (error: unknown) => {
            throw new UsageError(error instanceof CampaignFileError ? error.message : String(error));
          },
        );
  const parsedPlan = campaignPlanSchema.safeParse(planInput);
  if (!parsedPlan.success)
    throw new UsageError(
      `${planPath ?? `${resumeDir as string}/campaign.json`}: plan: ${describeIssues(parsedPlan.error)}`,
    );
  const plan: CampaignPlan = parsedPlan.data;
  try {
    validateCampaign(plan);
  } catch (error) {
    asUsageError(error);
  }
  const benchPath = flags.values.get('bench');
  const virtual = benchPath === undefined && !flags.booleans.has('real-time');
  const clock: Clock = virtual
    ? new VirtualClock({ autoAdvance: true, startWallIso: new Date().toISOString() })
    : new RealClock();
  io.stderr.write(`${CAUTIONS}\n${CHAMBER_CAUTIONS}\n`);
  const bench = await openBench(benchPath, dut, seed, clock);
  if (bench.simulated)
    io.stderr.write(
      `bench: simulated (${bench.sim?.dutParams.id ?? 'sim'}, chamber included)${virtual ? ', virtual time' : ''} — no instrument is touched\n`,
    );
  // The recording commands' last-resort guard: SIGINT/SIGTERM/SIGHUP stop the campaign cleanly (its own safe
  // state runs); a crash, a heap near its limit or a second signal, if the campaign has not ended within 8 s,
  // drive the campaign's safe state from here. SIGHUP once killed it with the outputs on.
  const { control, dispose } = cliControl(io, bench, plan.sweep.safe, (record) =>
    campaignSafeState(bench, plan, record),
  );
  const hooks: CampaignHooks = {
    changeUnit: unitChanger(io, bench.simulated),
    onState: (entry, file) => {
      const done = file.conditions.filter((c) => c.state === 'done').length;
      io.stderr.write(
        `[${done}/${file.conditions.length}] ${entry.unit} ${entry.temperatureC} °C ${entry.supplyV} V: ${entry.state}${entry.message ? ` — ${entry.message}` : ''}\n`,
      );
    },
    onEvent: (event) => {
      if (event.type === 'soak-timeout')
        io.stderr.write(
          `SOAK TIMEOUT at ${String(event.setpoint_c)} °C after ${Math.round(Number(event.waited_s))} s (DUT ${String(event.dut_c)} °C); plan says: ${plan.soak.onTimeout}\n`,
        );
      if (event.type === 'safe-state' && event.ok === false)
        io.stderr.write(`safe state step failed: ${String(event.step)} — ${String(event.error)}\n`);
    },
  };
  let outcome: CampaignOutcome;
  try {
    const work =
      resumeDir !== undefined
        ? resumeCampaign({ bench, clock, control, dir: resumeDir, ...hooks })
        : startCampaign({
            bench,
            clock,
            control,
            plan: planInput,
            runsDir: runsDirFrom(flags.values.get('runs'), io),
            ...hooks,
          });
    outcome = await work.catch((error: unknown) => {
      if (error instanceof LimitsError) asUsageError(error);
      if (error instanceof CampaignBusyError || error instanceof CampaignFileError) throw new UsageError(error.message);
      throw error;
    });
  } catch (error) {
    dispose();
    await bench.close();
    throw error;
  }
  const exitCode = outcome.failure !== null || outcome.file.status === 'aborted' || !outcome.safeStateOk ? 1 : 0;
  dispose({ safeStateOk: outcome.safeStateOk, exitCode });
  await bench.close();
  io.stdout.write(`${outcome.dir}\n`);
  io.stdout.write(
    `campaign ${outcome.file.status}${outcome.file.reason ? ` (${outcome.file.reason})` : ''}: ${outcome.file.conditions.filter((c) => c.state === 'done').length} of ${outcome.file.conditions.length} conditions done\n`,
  );
  if (!outcome.safeStateOk)
    io.stderr.write(
      'WARNING: the safe state could not be confirmed on every step — check the supply and the chamber now (see campaign-events.jsonl).\n',
    );
  if (outcome.file.conditions.some((c) => c.state === 'done')) {
    const { analysis } = await loadCampaignAnalysis(outcome.dir);
    io.stdout.write(`\n${renderCampaignMarkdown(analysis)}`);
  }
  if (outcome.failure !== null) io.stderr.write(`campaign failed: ${outcome.failure}\n`);
  else if (outcome.file.status === 'aborted')
    io.stderr.write(
      `campaign stopped (${outcome.file.reason ?? 'stop'}); supply off, chamber to its safe state. Resume with: tunebench campaign --resume ${outcome.dir}\n`,
    );
  return exitCode;
}

export const campaignCommand: CliCommand = {
  name: 'campaign',
  usage,
  run,
};
