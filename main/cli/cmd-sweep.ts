/**
 * `tunebench sweep [--bench BENCH.json] [--plan PLAN.json] [--runs DIR] [--dut-id ID] [--dut relaxation|varactor|FILE.json]`
 */
import { basename } from 'node:path';
import type { SweepPlan } from '../../app/contract/plans.ts';
import { loadSweepPlan } from './config-files.ts';
import { defaultSweepPlan } from './default-plans.ts';
import { summarizeRun } from './run-summary.ts';
import { recordSweep, validateSweepPlan } from '../procedures/recorded-run.ts';
import { recordingCommand } from './record-command.ts';

const mV = (volts: number): string => `${Number((volts * 1000).toPrecision(6))} mV`;

/** The default plan in words, made from the plan itself so the help cannot drift from it. */
export function describeDefaultSweep(plan: SweepPlan): string {
  const settle =
    plan.settle.mode === 'auto'
      ? `automatic settling (at most ${plan.settle.maxS} s)`
      : `${plan.settle.seconds} s fixed settling`;
  return [
    `${plan.start}–${plan.stop} V in ${mV(plan.step ?? 0)} steps (${plan.direction}), ${plan.readingsPerPoint} readings per point,`,
    `${plan.gateS * 1000} ms gate, ${settle}, stall edge refined to ${mV(plan.refineEdgeV)},`,
    `limits ${plan.limits.maxControlV} V / ${plan.limits.currentLimitA * 1000} mA`,
  ].join(' ');
}

function wrap(text: string, indent: string, width = 100): string {
  const lines: string[] = [];
  let line = '';
  for (const word of text.split(' ')) {
    if (line !== '' && indent.length + line.length + word.length + 1 > width) {
      lines.push(line);
      line = word;
    } else line = line === '' ? word : `${line} ${word}`;
  }
  lines.push(line);
  return lines.map((l) => `${indent}${l}`).join('\n');
}

const usage = `usage: tunebench sweep [--bench BENCH.json] [--plan PLAN.json] [--runs DIR] [--dut-id ID] [--dut relaxation|varactor|FILE.json]

Runs a gain sweep: steps the control voltage, settles, reads the counter,
refines the stall edge, and records every reading in a new run folder.
Without --bench it runs against the built-in simulated bench (in real time).

options:
  --bench FILE    bench file (addresses and profiles of supply, counter, thermometer)
  --plan FILE     sweep plan (start/stop/step or points, settle, limits, safe state); default:
${wrap(`relaxation DUT: ${describeDefaultSweep(defaultSweepPlan('relaxation'))}`, '                    ')}
${wrap(`varactor DUT: ${describeDefaultSweep(defaultSweepPlan('varactor'))}`, '                    ')}
  --runs DIR      runs folder (default: TUNEBENCH_RUNS, else the user data folder)
  --dut-id ID     DUT id recorded with the run
  --dut NAME      simulated DUT when there is no --bench: relaxation (default), varactor or a DUT model FILE.json

Every key of the plan and bench files: resources/docs/reference.md (or \`tunebench schema sweep-plan\`).
Ctrl+C stops the sweep cleanly: control voltage to the safe level, output off.
`;

export const sweepCommand = recordingCommand({
  name: 'sweep',
  usage,
  defaultPlan: defaultSweepPlan,
  loadPlan: loadSweepPlan,
  validate: validateSweepPlan,
  record: (options) => recordSweep(options),
  async report(recorded) {
    const summary = await summarizeRun(recorded.dir, `Gain table — ${basename(recorded.dir)}`, recorded.outcome);
    return [
      `status: ${recorded.meta.status}, ${recorded.outcome.rowsWritten} readings, ${recorded.outcome.refinedPoints} refined points\n`,
      summary.text,
      summary.tableMarkdown !== null ? `\n${summary.tableMarkdown}` : '',
    ].join('');
  },
});
