/**
 * The campaign: for each unit, each chamber temperature and each DUT supply
 * corner — soak, set the supply, sweep into an ordinary run folder in the
 * campaign folder. campaign.json is replaced atomically at every change of
 * state, so a crash at any moment leaves a file a resume can trust: finished
 * conditions are skipped, the one that was under way is done again (its
 * abandoned run stays, listed under earlierRunIds). The safe state
 * (campaign-safe.ts) runs on every way out.
 */
import {
  campaignPlanSchema,
  nominalControlOf,
  sweepRangeV,
  type CampaignPlan,
} from '../../../app/contract/campaign-plan.ts';
import type { Chamber } from '../../instruments/roles.ts';
import type { Clock } from '../../time/clock.ts';
import { LimitsError } from '../limits.ts';
import { recordSweep, validateSweepPlan, type RecordableBench, type RecordOptions } from '../recorded-run.ts';
import { RunStoppedError, type RunControl } from '../run-control.ts';
import { goSafe } from '../safe-state.ts';
import type { EventBody } from '../types.ts';
import { campaignSafeState } from './campaign-safe.ts';
import {
  appendCampaignEvent,
  appendSoakRow,
  claimCampaignFolder,
  createCampaignFolder,
  ensureSoakLog,
} from './campaign-folder.ts';
import {
  CAMPAIGN_SCHEMA,
  readCampaignFile,
  writeCampaignFile,
  type CampaignEntry,
  type CampaignFile,
} from './campaign-file.ts';
import { orderConditions } from './condition-order.ts';
import { setpointMatches } from '../../instruments/setpoint-match.ts';
import { soakAt, type SoakSample } from './soak.ts';

export type CampaignBench = RecordableBench & { chamber?: Chamber | undefined };

export interface CampaignHooks {
  /** Asks the operator to put `next` in the fixture (chamber at safeC, supply off). Resolves when done. */
  changeUnit?: (from: string, next: string) => Promise<void>;
  /** Every change of a condition's state, after campaign.json holds it (awaited). */
  onState?: (entry: CampaignEntry, file: CampaignFile) => void | Promise<void>;
  onSoakSample?: (entry: CampaignEntry, sample: SoakSample) => void;
  onEvent?: (event: EventBody) => void;
  /** Passed to each sweep. */
  sweep?: Pick<RecordOptions, 'onProgress' | 'onSample'>;
}

export interface CampaignOptions extends CampaignHooks {
  bench: CampaignBench;
  clock: Clock;
  control: RunControl;
}

export interface CampaignOutcome {
  dir: string;
  file: CampaignFile;
  safeStateOk: boolean;
  failure: string | null;
}

/** Refuses a campaign (before any write) that this bench or plan cannot run; names the field. */
export function validateCampaign(plan: CampaignPlan, bench?: CampaignBench): void {
  validateSweepPlan(plan.sweep);
  const [lo, hi] = sweepRangeV(plan.sweep);
  const nominal = nominalControlOf(plan);
  if (nominal < lo || nominal > hi)
    throw new LimitsError('nominalControlV', `${nominal} V is outside the sweep's range ${lo} … ${hi} V`);
  if (bench && !bench.chamber)
    throw new LimitsError(
      'bench.chamber',
      'a campaign needs a temperature chamber in the bench file ("chamber": { "address": … })',
    );
  if (bench && !bench.thermometer)
    throw new LimitsError('bench.thermometer', 'a campaign needs the thermometer on the DUT: it is the soak reference');
}

/** A new campaign folder under runsDir, then the campaign. */
export async function startCampaign(
  options: CampaignOptions & { plan: unknown; runsDir: string },
): Promise<CampaignOutcome> {
  const plan = campaignPlanSchema.parse(options.plan);
  validateCampaign(plan, options.bench);
  const { id, dir } = await createCampaignFolder(options.runsDir, options.clock.wallTimeIso(), plan.units[0] ?? 'dut');
  const now = options.clock.wallTimeIso();
  const file: CampaignFile = {
    schema: CAMPAIGN_SCHEMA,
    id,
    createdAt: now,
    updatedAt: now,
    status: 'running',
    reason: null,
    plan: options.plan,
    conditions: orderConditions(plan).map((c) => ({
      ...c,
      state: 'waiting',
      runId: null,
      earlierRunIds: [],
      soak: null,
      dutTemperatureC: null,
      message: null,
    })),
  };
  await writeCampaignFile(dir, file);
  return runCampaign(options, plan, dir, file);
}

/** Picks up a campaign folder: finished conditions stay, the rest are done (again). */
export async function resumeCampaign(options: CampaignOptions & { dir: string }): Promise<CampaignOutcome> {
  const file = await readCampaignFile(options.dir);
  const plan = campaignPlanSchema.parse(file.plan);
  validateCampaign(plan, options.bench);
  for (const entry of file.conditions) {
    if (entry.state === 'done') continue;
    if (entry.runId !== null) entry.earlierRunIds.push(entry.runId);
    entry.runId = null;
    if (entry.state !== 'waiting') entry.message = `was ${entry.state} when the campaign stopped; done again`;
    entry.state = 'waiting';
  }
  file.status = 'running';
  file.reason = null;
  return runCampaign(options, plan, options.dir, file, true);
}

async function runCampaign(
  options: CampaignOptions,
  plan: CampaignPlan,
  dir: string,
  file: CampaignFile,
  resumed = false,
): Promise<CampaignOutcome> {
  const { bench, clock } = options;
  const chamber = bench.chamber as Chamber;
  const startS = clock.now();
  const claim = await claimCampaignFolder(dir, file.createdAt);
  try {
    return await runClaimed(options, plan, dir, file, resumed, chamber, startS, claim.beat);
  } finally {
    await claim.release();
  }
}

async function runClaimed(
  options: CampaignOptions,
  plan: CampaignPlan,
  dir: string,
  file: CampaignFile,
  resumed: boolean,
  chamber: Chamber,
  startS: number,
  beat: () => Promise<void>,
): Promise<CampaignOutcome> {
  const { bench, clock, control } = options;
  let writes = Promise.resolve();
  const save = (): Promise<void> => {
    file.updatedAt = clock.wallTimeIso();
    const snapshot = structuredClone(file);
    writes = writes.then(() => writeCampaignFile(dir, snapshot)).then(beat);
    return writes;
  };
  // Event lines and soak rows are appended one after another, in the order they happened: concurrent appends
  // to one file land in whatever order the disk finishes them, and the same seed must give the same files.
  let appends = Promise.resolve();
  const append = (write: () => Promise<void>): void => {
    appends = appends.then(write).catch(() => undefined);
  };
  const event = (body: EventBody): void => {
    const stamped = { time_s: clock.now() - startS, at: clock.wallTimeIso(), ...body };
    append(() => appendCampaignEvent(dir, stamped));
    options.onEvent?.(stamped);
  };
  const setState = async (entry: CampaignEntry, state: CampaignEntry['state'], message?: string): Promise<void> => {
    entry.state = state;
    if (message !== undefined) entry.message = message;
    await save();
    event({
      type: 'condition',
      index: entry.index,
      state,
      unit: entry.unit,
      temperature_c: entry.temperatureC,
      supply_v: entry.supplyV,
      ...(message ? { message } : {}),
    });
    await options.onState?.(entry, file);
  };

  let failure: string | null = null;
  await ensureSoakLog(dir);
  event({ type: resumed ? 'campaign-resume' : 'campaign-start', conditions: file.conditions.length });
  await save();
  const nominalControlV = nominalControlOf(plan);
  try {
    chamber.setLimits(plan.chamber);
    const ramp = plan.rampCPerMin ?? plan.chamber.maxRateCPerMin;
    if (chamber.capabilities.rampRate) await chamber.setRampRate(ramp);
    else
      event({
        type: 'chamber-note',
        message: 'the chamber profile has no ramp-rate command: chamber.maxRateCPerMin rests on the chamber itself',
      });
    if (chamber.capabilities.runStop) await chamber.setRunning(true);
    const dutCh = bench.dutSupplyChannel;
    if (bench.supply.capabilities.overVoltageProtection) {
      await bench.supply.setOverVoltageProtection(dutCh, Math.max(plan.maxSupplyV * 1.05, plan.maxSupplyV + 0.05));
    }
    let unit: string | null = null;
    let soakedAtC: number | null = null;
    for (const entry of file.conditions) {
      if (entry.state === 'done') {
        unit = entry.unit;
        continue;
      }
      await control.checkpoint(clock);
      if (unit !== null && entry.unit !== unit) {
        await changeUnit(options, plan, chamber, unit, entry.unit, event);
        soakedAtC = null;
      }
      unit = entry.unit;
      if (soakedAtC !== entry.temperatureC) {
        await setState(entry, 'soaking');
        const soak = await soakAt({
          bench: { ...bench, chamber },
          clock,
          soak: plan.soak,
          setpointC: entry.temperatureC,
          signal: control.signal,
          drift: { controlV: nominalControlV, limits: plan.sweep.limits, gateS: plan.sweep.gateS },
          event,
          onSample: (sample) => {
            const row = [
              entry.index,
              sample.timeS - startS,
              sample.setpointC,
              sample.airC,
              sample.dutC,
              sample.frequencyHz,
            ];
            append(() => appendSoakRow(dir, row));
            options.onSoakSample?.(entry, sample);
          },
        });
        entry.soak = { ...soak };
        if (soak.result === 'timeout') {
          const message = `soak at ${entry.temperatureC} °C timed out after ${Math.round(soak.waitedS)} s (DUT ${soak.dutC ?? '?'} °C); plan: ${plan.soak.onTimeout}`;
          event({ type: 'soak-timeout-action', index: entry.index, action: plan.soak.onTimeout, message });
          if (plan.soak.onTimeout === 'stop') {
            await setState(entry, 'failed', message);
            throw new CampaignStop(message, 'soak-timeout');
          }
          if (plan.soak.onTimeout === 'skip') {
            // Every corner at this temperature is skipped with it.
            for (const other of file.conditions) {
              if (other.unit === entry.unit && other.temperatureC === entry.temperatureC && other.state !== 'done')
                await setState(other, 'skipped', message);
            }
            soakedAtC = null;
            // A drift-checked soak left the control output on; it does not stay on through a skip.
            await safeControl(bench, plan, event);
            continue;
          }
          entry.message = message;
        }
        soakedAtC = entry.temperatureC;
      }
      if (entry.state === 'skipped') continue;
      await setDutSupply(bench, plan, entry.supplyV, clock, control.signal);
      await setState(entry, 'sweeping');
      const recorded = await recordSweep({
        bench,
        clock,
        control,
        runsDir: dir,
        plan: plan.sweep,
        dutId: entry.unit,
        dutNotes: `campaign ${file.id}: chamber ${entry.temperatureC} °C, DUT supply ${entry.supplyV} V`,
        startEvents: [
          {
            type: 'campaign-condition',
            campaign: file.id,
            index: entry.index,
            unit: entry.unit,
            setpoint_c: entry.temperatureC,
            supply_v: entry.supplyV,
            soak: entry.soak,
          },
        ],
        onRunStarted: (meta) => {
          entry.runId = meta.id;
          void save();
        },
        ...options.sweep,
      });
      const t = recorded.meta.conditions?.temperatureC;
      entry.dutTemperatureC = t ? { start: t.start, end: t.end } : null;
      if (recorded.outcome.status === 'complete' && recorded.outcome.failure === null) {
        await setState(entry, 'done');
        continue;
      }
      if (control.signal.aborted) {
        if (entry.runId !== null) entry.earlierRunIds.push(entry.runId);
        entry.runId = null;
        await setState(entry, 'waiting', 'stopped during its sweep; done again on resume');
        throw new RunStoppedError(control.stopReason ?? 'stop');
      }
      const why = recorded.outcome.failure?.message ?? recorded.outcome.reason ?? 'aborted';
      await setState(entry, 'failed', why);
      throw new CampaignStop(
        `condition ${entry.index} (${entry.unit}, ${entry.temperatureC} °C, ${entry.supplyV} V): sweep failed — ${why}`,
        'sweep-failed',
      );
    }
    file.status = 'complete';
  } catch (error) {
    if (error instanceof RunStoppedError || control.signal.aborted) {
      // A stop shows as RunStoppedError at a checkpoint or as an aborted wait inside a soak.
      file.status = 'aborted';
      file.reason = control.stopReason ?? (error instanceof Error ? error.message : 'stop');
      for (const entry of file.conditions) {
        if (entry.state === 'soaking' || entry.state === 'sweeping') {
          entry.state = 'waiting';
          entry.message = 'stopped; done again on resume';
        }
      }
    } else {
      file.status = 'failed';
      file.reason = error instanceof CampaignStop ? error.reason : error instanceof Error ? error.name : 'error';
      failure = error instanceof Error ? error.message : String(error);
      for (const entry of file.conditions) {
        if (entry.state === 'soaking' || entry.state === 'sweeping') {
          entry.state = 'failed';
          entry.message = failure;
        }
      }
      event({ type: 'campaign-error', error: failure });
    }
  }
  const safe = await campaignSafeState({ ...bench, chamber }, plan, event);
  event({ type: 'campaign-end', status: file.status, safe_state_ok: safe.ok });
  await save();
  await appends;
  return { dir, file, safeStateOk: safe.ok, failure };
}

/** The control channel to its safe state; a failed step stops the campaign. */
async function safeControl(bench: CampaignBench, plan: CampaignPlan, event: (e: EventBody) => void): Promise<void> {
  const result = await goSafe(bench, bench.controlChannel, plan.sweep.safe, event);
  if (!result.ok) throw new CampaignStop(`control channel not safe: ${result.failures.join('; ')}`, 'safe-state');
}

/** Stops the campaign with a reason recorded in campaign.json. */
export class CampaignStop extends Error {
  override name = 'CampaignStop';
  constructor(
    message: string,
    readonly reason: string,
  ) {
    super(message);
  }
}

/** The DUT supply to `volts` (checked against maxSupplyV before the write), read back, output on. */
async function setDutSupply(
  bench: CampaignBench,
  plan: CampaignPlan,
  volts: number,
  clock: Clock,
  signal: AbortSignal,
): Promise<void> {
  if (!(volts > 0) || volts > plan.maxSupplyV)
    throw new LimitsError('supplyV', `${volts} V exceeds maxSupplyV (${plan.maxSupplyV} V)`);
  const ch = bench.dutSupplyChannel;
  // Defence in depth: the driver itself refuses any DUT-supply write above maxSupplyV from here on.
  bench.supply.limitChannel(ch, 'dut-supply', plan.maxSupplyV);
  await bench.supply.setVoltage(ch, volts);
  const readBack = await bench.supply.getVoltageSetpoint(ch);
  if (!setpointMatches(readBack, volts)) {
    throw new CampaignStop(
      `DUT supply (channel ${ch}) reads back ${readBack} V after ${volts} V was set`,
      'supply-readback',
    );
  }
  if (!(await bench.supply.getOutput(ch))) await bench.supply.setOutput(ch, true);
  // The DUT's own supply decoupling settles in well under a second (common practice: wait, then measure).
  await clock.sleep(1, signal);
}

/** Chamber to safeC, DUT supply off, operator swaps the unit, supply on again at the next condition. */
async function changeUnit(
  options: CampaignOptions,
  plan: CampaignPlan,
  chamber: Chamber,
  from: string,
  next: string,
  event: (e: EventBody) => void,
): Promise<void> {
  const { bench, clock, control } = options;
  event({ type: 'unit-change', from, to: next, safe_c: plan.safeC });
  // Nothing drives the tuning port of a board about to be unpowered and unplugged.
  await safeControl(bench, plan, event);
  await chamber.setSetpoint(plan.safeC);
  // Wait for the air (the door is about to open), not the DUT.
  const deadline = clock.now() + plan.soak.timeoutS;
  for (;;) {
    const air = await chamber.readAirTemperature();
    if (Math.abs(air - plan.safeC) <= Math.max(2, plan.soak.toleranceC) || clock.now() >= deadline) break;
    await clock.sleep(plan.soak.readIntervalS, control.signal);
  }
  await bench.supply.setOutput(bench.dutSupplyChannel, false);
  if (options.changeUnit) await options.changeUnit(from, next);
  else throw new CampaignStop(`unit change ${from} → ${next} needs an operator, and none is attached`, 'unit-change');
  await control.checkpoint(clock);
}
