/**
 * Child process for the crash test: a real-time writer appending one reading
 * every ~20 ms. Prints `dir <path>` once, then each reading's index right
 * after appending it, so the parent knows what was handed to the writer
 * before it sent SIGKILL. Usage: node --import tsx crash-writer-child.ts RUNS_DIR [resume-id]
 */
import { RealClock } from '../../time/real-clock.ts';
import { reopenRun } from '../reopen-run.ts';
import { createRun } from '../run-writer.ts';

const [runsDir, resumeId] = process.argv.slice(2);
if (!runsDir) throw new Error('usage: crash-writer-child.ts RUNS_DIR [resume-id]');
const clock = new RealClock();
const writer = resumeId
  ? await reopenRun({ runsDir, id: resumeId, clock })
  : await createRun({
      runsDir,
      kind: 'drift',
      dut: { id: 'sensor-osc-crash' },
      instruments: [{ role: 'counter', idn: 'SIM,COUNTER', address: 'sim' }],
      plan: { controlV: 2.5, intervalS: 0.02, durationS: 60 },
      columns: ['index', 'time_s', 'control_v', 'frequency_hz', 'temperature_c', 'status'],
      clock,
    });
process.stdout.write(`dir ${writer.dir}\n`);
const first = Number(process.env.CRASH_FIRST_INDEX ?? 0);
for (let index = first; ; index++) {
  const timeS = writer.elapsedS();
  writer.appendSample([index, timeS, 2.5, 8.192e6 + Math.sin(index / 50) * 12.5, 25 + index * 1e-4, 'ok']);
  process.stdout.write(`${index}\n`);
  await clock.sleep(0.02);
}
