/**
 * A child process running a real-time drift log is killed with SIGKILL: the
 * run reopens as `interrupted`, samples.csv parses, at most the last second
 * of readings is missing; then the log is resumed into the same folder with
 * the gap recorded.
 */
import { type ChildProcess, spawn } from 'node:child_process';
import { mkdtemp, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { basename, dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { afterAll, describe, expect, it } from 'vitest';
import { onStdoutLines } from '../../test/testing/child-stdout-lines.ts';
import { assembleBench } from '../bench/assemble.ts';
import { parseSamplesCsv, readRunFolder } from '../store/index.ts';
import { RealClock } from '../time/real-clock.ts';
import { resumeDrift } from './recorded-run.ts';
import { RunControl } from './run-control.ts';

const CHILD = fileURLToPath(new URL('./testing/drift-child.ts', import.meta.url));
const dirs: string[] = [];
afterAll(async () => {
  for (const dir of dirs) await rm(dir, { recursive: true, force: true });
});

function runAndKill(
  runsDir: string,
  rows: number,
): Promise<{ dir: string; seen: { timeS: number; frequencyHz: number }[] }> {
  return new Promise((resolve, reject) => {
    const child: ChildProcess = spawn(process.execPath, ['--import', 'tsx', CHILD, runsDir], {
      stdio: ['ignore', 'pipe', 'pipe'],
    });
    let dir = '';
    let stderr = '';
    let killed = false;
    const seen: { timeS: number; frequencyHz: number }[] = [];
    child.stderr?.on('data', (chunk: Buffer) => (stderr += chunk.toString()));
    onStdoutLines(
      child,
      (line) => {
        const [tag, a, b] = line.split(' ');
        if (tag === 'dir') dir = line.slice(4);
        else if (tag === 'row') seen.push({ timeS: Number(a), frequencyHz: Number(b) });
      },
      () => {
        if (!killed && seen.length >= rows) {
          killed = true;
          child.kill('SIGKILL');
        }
      },
    );
    child.on('error', reject);
    child.on('exit', (_code, signal) =>
      signal === 'SIGKILL' ? resolve({ dir, seen }) : reject(new Error(`child ended without SIGKILL: ${stderr}`)),
    );
  });
}

describe('drift log killed with SIGKILL', () => {
  it(
    'reopens as interrupted with at most the last second missing, and resumes with the gap recorded',
    { timeout: 60_000 },
    async () => {
      const runsDir = await mkdtemp(join(tmpdir(), 'tunebench-driftcrash-'));
      dirs.push(runsDir);
      const killed = await runAndKill(runsDir, 60); // about 3 s of readings at 50 ms
      const run = await readRunFolder(killed.dir);
      expect(run.meta.status).toBe('interrupted');
      const samples = parseSamplesCsv(run.samplesCsv);
      const onDiskTimes = samples.numeric.time_s as number[];
      const onDiskHz = samples.numeric.frequency_hz as number[];
      // What is on disk is exactly the first rows the child recorded, in order.
      expect(onDiskTimes.length).toBeGreaterThan(0);
      for (let i = 0; i < onDiskTimes.length; i++) {
        expect(onDiskTimes[i]).toBeCloseTo(killed.seen[i]?.timeS as number, 9);
        expect(onDiskHz[i]).toBe(killed.seen[i]?.frequencyHz);
      }
      const lastSeenS = killed.seen[killed.seen.length - 1]?.timeS as number;
      const lastOnDiskS = onDiskTimes[onDiskTimes.length - 1] as number;
      console.log(
        `drift crash: ${killed.seen.length} rows recorded, ${onDiskTimes.length} on disk, last ${(lastSeenS - lastOnDiskS).toFixed(3)} s missing`,
      );
      // At most the last second is missing: every row recorded more than 1 s before the last one is on disk.
      const mustHave = killed.seen.filter((row) => row.timeS <= lastSeenS - 1.0).length;
      expect(onDiskTimes.length).toBeGreaterThanOrEqual(mustHave);

      // Resume in this process for about one second, then stop cleanly.
      const clock = new RealClock();
      const bench = await assembleBench('sim', { clock, sim: { dut: 'relaxation', seed: 4 } });
      const control = new RunControl();
      clock.setTimer(1, () => control.stop('stop'));
      const resumed = await resumeDrift({ bench, clock, runsDir, id: basename(killed.dir), control });
      await bench.close();
      expect(resumed.dir).toBe(killed.dir);
      expect(dirname(resumed.dir)).toBe(runsDir);
      expect(resumed.meta.status).toBe('complete');
      const after = await readRunFolder(killed.dir);
      const gap = after.events.find((e) => e.type === 'gap');
      expect(gap).toBeDefined();
      const afterTimes = parseSamplesCsv(after.samplesCsv).numeric.time_s as number[];
      expect(afterTimes.length).toBeGreaterThan(onDiskTimes.length + 5);
      // time_s keeps growing across the gap.
      for (let i = 1; i < afterTimes.length; i++)
        expect(afterTimes[i] as number).toBeGreaterThan(afterTimes[i - 1] as number);
      expect(after.events.some((e) => e.type === 'resumed')).toBe(true);
    },
  );
});
