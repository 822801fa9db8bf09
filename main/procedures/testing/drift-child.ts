/**
 * Child process for the drift crash test: a real-time drift log on the
 * in-process simulated bench, 50 ms interval. Prints `dir <path>` once, then
 * `row <time_s> <frequency_hz>` for each row right after it is handed to the
 * run writer, so the parent knows what was recorded before its SIGKILL.
 * Usage: node --import tsx drift-child.ts RUNS_DIR
 */
import { driftPlanSchema } from '../../../app/contract/plans.ts';
import { assembleBench } from '../../bench/assemble.ts';
import { RealClock } from '../../time/real-clock.ts';
import { recordDrift } from '../recorded-run.ts';

const [runsDir] = process.argv.slice(2);
if (!runsDir) throw new Error('usage: drift-child.ts RUNS_DIR');
const clock = new RealClock();
const bench = await assembleBench('sim', { clock, sim: { dut: 'relaxation', seed: 3 } });
const plan = driftPlanSchema.parse({
  controlV: 3,
  intervalS: 0.05,
  durationS: 3600,
  gateS: 0.02,
  limits: { maxControlV: 5, currentLimitA: 0.02 },
});
await recordDrift({
  bench,
  plan,
  clock,
  runsDir,
  dutId: 'sensor-osc-crash',
  onRunStarted: (_meta, dir) => process.stdout.write(`dir ${dir}\n`),
  onSample: (row) => process.stdout.write(`row ${String(row.time_s)} ${String(row.frequency_hz)}\n`),
});
