/**
 * `tunebench drift [--bench …] [--plan …] [--runs DIR] [--duration 8h] [--interval 1s] [--resume RUN_ID]`
 */
import { parseDurationS, TIME_FORMS } from '../../app/contract/si.ts';
import type { DriftPlan } from '../../app/contract/plans.ts';
import { loadDriftPlan } from './config-files.ts';
import { formatClockDuration } from '../../app/analysis/format-clock.ts';
import { defaultDriftPlan } from './default-plans.ts';
import { summarizeRun } from './run-summary.ts';
import { recordDrift, resumeDrift, validateDriftPlan } from '../procedures/recorded-run.ts';
import { StoreError } from '../store/store-error.ts';
import { positiveFlag } from './flags.ts';
import { recordingCommand } from './record-command.ts';
import { UsageError } from './types.ts';

const usage = `usage: tunebench drift [--bench BENCH.json] [--plan PLAN.json] [--runs DIR] [--duration 8h] [--interval 1s]
                       [--dut-id ID] [--dut relaxation|varactor|FILE.json] [--resume RUN_ID]

Holds the control voltage and logs frequency (and temperature, with a
thermometer on the bench) every interval until the duration ends or Ctrl+C —
a clean stop that keeps everything recorded. The first reading waits until the
tuning port has settled at the control voltage (plan "settle"; default
automatic, at most 10 s). Dropped links are reopened and the gaps recorded.
Without --bench it runs on the built-in simulated bench.

options:
  --plan FILE       drift plan { controlV, intervalS, durationS, gateS, settle, limits, safe }
  --duration TIME   overrides the plan: 90s, 15min, 8h (default 8h)
  --interval TIME   overrides the plan: time between readings, e.g. 500ms, 1s (default 1s)
  --resume RUN_ID   carry on an interrupted drift log in its own folder (gap recorded)
  --runs, --dut-id, --dut, --bench as for \`tunebench sweep\`

A time needs its unit (ms, s, min, h, d); a bare number is seconds; "15m" is refused as ambiguous.
Every key of the plan file: resources/docs/reference.md (or \`tunebench schema drift-plan\`).
`;

function timeFlag(name: string, text: string | undefined): number | undefined {
  return positiveFlag(name, text, parseDurationS, (got) => {
    const ambiguous = /^\s*([\d.]+)\s*m\s*$/.exec(got);
    return ambiguous
      ? `"${got}" is ambiguous: write ${ambiguous[1]}ms or ${ambiguous[1]}min`
      : `expected ${TIME_FORMS}, got "${got}"`;
  });
}

export const driftCommand = recordingCommand({
  name: 'drift',
  usage,
  flags: { values: ['duration', 'interval', 'resume'] },
  defaultPlan: defaultDriftPlan,
  loadPlan: loadDriftPlan,
  applyFlags(plan: DriftPlan, flags) {
    const durationS = timeFlag('duration', flags.values.get('duration'));
    const intervalS = timeFlag('interval', flags.values.get('interval'));
    return {
      ...plan,
      ...(durationS === undefined ? {} : { durationS }),
      ...(intervalS === undefined ? {} : { intervalS }),
    };
  },
  validate: validateDriftPlan,
  notice(plan, flags) {
    if (flags.values.has('duration') || flags.values.has('plan') || flags.values.has('resume')) return null;
    return `drift: no --duration given, so the log runs ${formatClockDuration(plan.durationS)} (the default); shorten it with e.g. --duration 15min, or stop it any time with Ctrl+C`;
  },
  folderNote: '(Ctrl+C ends the log cleanly)',
  record(options, flags) {
    const resumeId = flags.values.get('resume');
    if (resumeId === undefined) return recordDrift(options);
    return resumeDrift({ ...options, id: resumeId }).catch((error: unknown) => {
      if (error instanceof StoreError || error instanceof RangeError)
        throw new UsageError(`--resume ${resumeId}: ${error.message}`);
      throw error;
    });
  },
  async report(recorded) {
    return `status: ${recorded.meta.status}, ${recorded.outcome.readings} readings, ${recorded.outcome.gaps} gap(s)\n${(await summarizeRun(recorded.dir, undefined, recorded.outcome)).text}`;
  },
});
