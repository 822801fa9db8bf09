/**
 * Big inputs to `tunebench analyze` (issue 15 item 9): a 1e6-row sweep CSV,
 * a sweep of 1e6 distinct voltages, and a 1e6-row drift CSV. Target for each:
 * at most 2 s and 300 MB on this machine. Each case runs the CLI in a fresh
 * process started the way the `tunebench` launcher starts it (the prebuilt
 * bundle, rebuilt first with `npm run build:cli` when stale, as `npm install`
 * leaves it; start-up included in the wall time), which reports its own CPU
 * time and peak resident memory. Wall time is what a user waits; CPU time is
 * the honest figure when other work shares the machine.
 *
 * Run: npx tsx test/bench/big-inputs.ts   (or `npm run bench -- big-inputs`)
 */
import { spawn } from 'node:child_process';
import { mkdtemp, rm, writeFile } from 'node:fs/promises';
import { cpus, loadavg, tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';
import { bundleStaleReason } from '../../main/bin/cli-bundle.mjs';

const CHILD = fileURLToPath(new URL('./analyze-child.mjs', import.meta.url));
const BUILD = fileURLToPath(new URL('../../main/bin/build.mjs', import.meta.url));
const TARGET_S = 2;
const TARGET_MB = 300;
const ROWS = 1_000_000;

interface ChildReport {
  code: number;
  outBytes: number;
  launch: string;
  cpuMs: number;
  maxRssMB: number;
}

/** Deterministic text of each case (a 1 kHz/V sensor oscillator with a little noise; a drift log at 1 s). */
function caseText(kind: 'sweep' | 'distinct' | 'drift'): string {
  const lines: string[] = kind === 'drift' ? ['time_s,frequency_hz,temperature_c'] : ['control_v,frequency_hz'];
  for (let i = 0; i < ROWS; i++) {
    const noise = Math.sin(i * 12.9898) * 0.5;
    if (kind === 'sweep') {
      const v = 0.5 + Math.floor(i / 1000) * 0.004; // 1000 points × 1000 readings
      lines.push(`${v.toFixed(3)},${(8000 + 2000 * v + noise).toFixed(1)}`);
    } else if (kind === 'distinct') {
      const v = 0.5 + i * 4e-6; // every reading its own point
      lines.push(`${v.toFixed(6)},${(8000 + 2000 * v + noise).toFixed(1)}`);
    } else {
      lines.push(
        `${i},${(10e6 + 3 * Math.sin(i * 1e-3) + noise * 0.01).toFixed(3)},${(25 + Math.sin(i * 1e-4)).toFixed(2)}`,
      );
    }
  }
  return `${lines.join('\n')}\n`;
}

/** `npm run build:cli`: the bundle the launcher runs. */
function buildCliBundle(): Promise<void> {
  return new Promise((resolve, reject) => {
    const child = spawn(process.execPath, [BUILD, 'cli'], { stdio: ['ignore', 'ignore', 'inherit'] });
    child.on('error', reject);
    child.on('exit', (code) => (code === 0 ? resolve() : reject(new Error(`build:cli exited ${code}`))));
  });
}

function runChild(args: string[]): Promise<{ wallS: number; report: ChildReport }> {
  return new Promise((resolve, reject) => {
    const t0 = performance.now();
    const child = spawn(process.execPath, [CHILD, ...args], { stdio: ['ignore', 'ignore', 'pipe'] });
    let stderr = '';
    child.stderr.on('data', (chunk: Buffer) => (stderr += chunk.toString()));
    child.on('error', reject);
    child.on('exit', () => {
      const wallS = (performance.now() - t0) / 1000;
      const last = stderr.trim().split('\n').pop() ?? '';
      try {
        resolve({ wallS, report: JSON.parse(last) as ChildReport });
      } catch {
        reject(new Error(`analyze child printed no report: ${stderr.slice(-500)}`));
      }
    });
  });
}

export async function runBigInputsBench(): Promise<void> {
  console.log(
    `big inputs to analyze: ${ROWS.toExponential(0)} rows each; target ≤ ${TARGET_S} s and ≤ ${TARGET_MB} MB (machine: ${cpus().length} cores, load ${loadavg()[0]?.toFixed(1)})`,
  );
  if (bundleStaleReason() !== null) await buildCliBundle();
  const dir = await mkdtemp(join(tmpdir(), 'tunebench-big-'));
  try {
    for (const [kind, label] of [
      ['sweep', '1e6-row sweep CSV (1000 points)'],
      ['distinct', 'sweep of 1e6 distinct voltages'],
      ['drift', '1e6-row drift CSV'],
    ] as const) {
      const file = join(dir, `${kind}.csv`);
      const text = caseText(kind);
      await writeFile(file, text);
      for (const mode of [[], ['--json']]) {
        const { wallS, report } = await runChild([file, ...mode]);
        const meets = report.code === 0 && wallS <= TARGET_S && report.maxRssMB <= TARGET_MB;
        // Wall time stretches with the machine's load (other work on the same cores): the load is printed beside it.
        console.log(
          `  ${`${label}${mode.length ? ' --json' : ''}`.padEnd(44)} ${(text.length / 1e6).toFixed(1).padStart(5)} MB in: ` +
            `wall ${wallS.toFixed(2)} s at load ${loadavg()[0]?.toFixed(1)}, CPU ${(report.cpuMs / 1000).toFixed(2)} s, peak RSS ${report.maxRssMB.toFixed(0)} MB, ` +
            `${(report.outBytes / 1e6).toFixed(1)} MB out, exit ${report.code} [${report.launch}] → ${meets ? 'meets' : 'MISSES'} target (≤ ${TARGET_S} s, ≤ ${TARGET_MB} MB)`,
        );
      }
    }
  } finally {
    await rm(dir, { recursive: true, force: true });
  }
}

if (import.meta.url === pathToFileURL(process.argv[1] ?? '').href) await runBigInputsBench();
