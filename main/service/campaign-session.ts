/**
 * A campaign run for the app: the procedure (main/procedures/campaign/) on
 * the connected bench, its state pushed to every page as `campaign` events,
 * soak readings and the live sweep in batches, and the unit change asked of
 * the operator as a question the campaign waits on (the CLI asks on its
 * terminal instead). Stopping drives the campaign's own safe state: supply
 * outputs off, chamber to safeC (or stopped, per its profile).
 */
import type { BenchEvent } from '../../app/contract/bench-api.ts';
import { campaignPlanSchema } from '../../app/contract/campaign-plan.ts';
import type { CampaignView, SoakSampleView, SweepPointView } from '../../app/contract/campaign-schemas.ts';
import type { CampaignFile } from '../procedures/campaign/campaign-file.ts';
import {
  resumeCampaign,
  startCampaign,
  type CampaignBench,
  type CampaignOutcome,
} from '../procedures/campaign/run-campaign.ts';
import { RunControl } from '../procedures/run-control.ts';
import type { Clock } from '../time/clock.ts';
import { SampleBatcher } from './sample-batcher.ts';

export interface CampaignSessionOptions {
  bench: CampaignBench;
  clock: Clock;
  runsDir: string;
  emit: (event: BenchEvent) => void;
  /** Real ms between soak and sweep batches. Default 150. */
  batchMs?: number;
}

export interface CampaignSession {
  control: RunControl;
  /** The campaign's state now. */
  view(): CampaignView;
  /** The operator has changed the unit. */
  confirmUnitChange(): boolean;
  /** Resolves once the campaign has ended and its safe state has been driven. */
  done: Promise<CampaignOutcome | null>;
}

/** campaign.json as the screen shows it. */
export function viewOf(
  file: CampaignFile,
  extra: Pick<CampaignView, 'active' | 'unitChange' | 'safeStateOk'>,
): CampaignView {
  return {
    id: file.id,
    status: file.status,
    reason: file.reason,
    ...extra,
    conditions: file.conditions.map((c) => ({
      index: c.index,
      unit: c.unit,
      temperatureC: c.temperatureC,
      supplyV: c.supplyV,
      state: c.state,
      runId: c.runId,
      message: c.message,
    })),
  };
}

/**
 * Starts (plan) or resumes (dir) a campaign; resolves with the session once
 * campaign.json exists, rejects when the campaign is refused before that.
 */
export function startCampaignSession(
  options: CampaignSessionOptions,
  what: { plan: unknown } | { dir: string; file: CampaignFile },
): Promise<CampaignSession> {
  const control = new RunControl();
  // A resumed campaign may open with a unit change, before any condition changes state: show its file at once.
  let file: CampaignFile | null =
    'file' in what
      ? {
          ...what.file,
          status: 'running',
          conditions: what.file.conditions.map((c) => (c.state === 'done' ? c : { ...c, state: 'waiting' })),
        }
      : null;
  let unitChange: CampaignView['unitChange'] = null;
  let answer: (() => void) | null = null;
  let safeStateOk: boolean | null = null;
  let active = true;
  let sweepIndex = -1;
  const view = (): CampaignView => {
    if (file === null) throw new Error('the campaign has not started');
    return viewOf(file, { active, unitChange, safeStateOk });
  };
  const push = (): void => {
    if (file !== null) options.emit({ type: 'campaign', campaign: view() });
  };
  const soak = new SampleBatcher<SoakSampleView>(
    (samples) => options.emit({ type: 'campaign-soak', samples }),
    options.batchMs,
  );
  // Every condition sweeps with the plan's one gate; the page writes the readings to the 1/gate they resolve.
  const gateS = sweepGateOf('plan' in what ? what.plan : what.file.plan);
  const sweep = new SampleBatcher<SweepPointView>(
    (points) =>
      options.emit({ type: 'campaign-sweep', index: sweepIndex, points, ...(gateS !== null ? { gateS } : {}) }),
    options.batchMs,
  );
  const startS = options.clock.now();
  return new Promise((resolveStarted, rejectStarted) => {
    let started = false;
    const common = {
      bench: options.bench,
      clock: options.clock,
      control,
      onEvent: (event: { type: string }) => {
        if (event.type === 'campaign-resume' && file !== null && !started) {
          started = true;
          resolveStarted(session);
          push();
        }
      },
      onState: (entry: { index: number; state: string }, current: CampaignFile) => {
        file = current;
        if (entry.state === 'sweeping') {
          sweep.flushNow();
          sweepIndex = entry.index;
        }
        if (!started) {
          started = true;
          resolveStarted(session);
        }
        push();
      },
      onSoakSample: (
        entry: { index: number },
        s: { timeS: number; setpointC: number; airC: number | null; dutC: number },
      ) =>
        soak.push({ index: entry.index, timeS: s.timeS - startS, setpointC: s.setpointC, airC: s.airC, dutC: s.dutC }),
      changeUnit: (from: string, to: string) =>
        new Promise<void>((resolve, reject) => {
          unitChange = { from, to, safeC: planSafeC(file) };
          const onAbort = (): void => reject(new Error('stopped while waiting for the unit change'));
          control.signal.addEventListener('abort', onAbort, { once: true });
          answer = () => {
            control.signal.removeEventListener('abort', onAbort);
            unitChange = null;
            answer = null;
            resolve();
            push();
          };
          push();
        }),
      sweep: {
        onSample: (row: Record<string, number | string>) => {
          const v = row.control_v;
          const f = row.frequency_hz;
          if (typeof v === 'number')
            sweep.push({ controlV: v, frequencyHz: typeof f === 'number' && Number.isFinite(f) ? f : null });
        },
      },
    };
    const work =
      'plan' in what
        ? startCampaign({ ...common, plan: what.plan, runsDir: options.runsDir })
        : resumeCampaign({ ...common, dir: what.dir });
    const done = work.then(
      (outcome) => {
        soak.flushNow();
        sweep.flushNow();
        file = outcome.file;
        active = false;
        unitChange = null;
        safeStateOk = outcome.safeStateOk;
        push();
        if (!started) {
          started = true;
          resolveStarted(session);
        }
        return outcome;
      },
      (error: unknown) => {
        active = false;
        if (!started) {
          started = true;
          rejectStarted(error instanceof Error ? error : new Error(String(error)));
          return null;
        }
        options.emit({ type: 'error', message: `campaign: ${error instanceof Error ? error.message : String(error)}` });
        push();
        return null;
      },
    );
    const session: CampaignSession = {
      control,
      view,
      confirmUnitChange() {
        if (answer === null) return false;
        answer();
        return true;
      },
      done,
    };
  });
}

/** The counter gate (s) of the campaign's sweeps; null for a plan the campaign itself will refuse. */
function sweepGateOf(plan: unknown): number | null {
  const parsed = campaignPlanSchema.safeParse(plan);
  return parsed.success ? parsed.data.sweep.gateS : null;
}

function planSafeC(file: CampaignFile | null): number {
  const plan = file?.plan as { safeC?: unknown } | undefined;
  return typeof plan?.safeC === 'number' ? plan.safeC : 25;
}
