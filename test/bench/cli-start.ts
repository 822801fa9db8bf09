/**
 * CLI start (issue 12 item 1): wall time of `tunebench --help` through the
 * package's bin against a bare `node -e 0` (target ≤ 3×), of `analyze` on a
 * 100-point sweep CSV (target ≤ 300 ms), and of both through `npx tunebench`
 * (npm's own start-up on top; the targets are the bin's). Runs interleaved,
 * medians printed with the machine's load average and the CPU time, since
 * other work on the machine shows directly in wall times.
 */
import { execFileSync, spawnSync } from 'node:child_process';
import { mkdtemp, rm, writeFile } from 'node:fs/promises';
import { cpus, loadavg, tmpdir } from 'node:os';
import { join } from 'node:path';
import { performance } from 'node:perf_hooks';
import { fileURLToPath } from 'node:url';

const ROOT = fileURLToPath(new URL('../../', import.meta.url));
const BIN = join(ROOT, 'main/bin/tunebench.mjs');

function median(values: number[]): number {
  const sorted = [...values].sort((a, b) => a - b);
  const mid = sorted.length >> 1;
  return sorted.length % 2 === 1
    ? (sorted[mid] as number)
    : ((sorted[mid - 1] as number) + (sorted[mid] as number)) / 2;
}

/** CPU time (user + system) of each run, as the shell's `times` reports it for its children. */
const cpuMs = new Map<string, number[]>();

function seconds(text: string): number {
  const m = /^(\d+)m([\d.]+)s$/.exec(text);
  return m ? Number(m[1]) * 60 + Number(m[2]) : Number.NaN;
}

function wallMs(label: string, command: string, args: string[], env: NodeJS.ProcessEnv = process.env): number {
  const t0 = performance.now();
  const result = spawnSync('/bin/sh', ['-c', '"$@" >/dev/null || exit 1; times', 'sh', command, ...args], {
    cwd: ROOT,
    env,
    stdio: ['ignore', 'pipe', 'pipe'],
  });
  const ms = performance.now() - t0;
  if (result.status !== 0)
    throw new Error(`${command} ${args.join(' ')} exited ${result.status}: ${result.stderr.toString().slice(0, 300)}`);
  const children = result.stdout.toString().trim().split('\n').at(-1)?.split(/\s+/) ?? [];
  const cpu = (seconds(children[0] ?? '') + seconds(children[1] ?? '')) * 1000;
  cpuMs.set(label, [...(cpuMs.get(label) ?? []), cpu]);
  return ms;
}

/** A 100-point sweep CSV of our own (quadratic tuning curve, 10 kHz range). */
function sweepCsv(): string {
  const lines = ['control_v,frequency_hz'];
  for (let i = 0; i < 100; i++) {
    const v = 1 + i * 0.03;
    lines.push(`${v.toFixed(3)},${(1000 + 2500 * v - 120 * v * v + 3 * Math.sin(i)).toFixed(1)}`);
  }
  return `${lines.join('\n')}\n`;
}

export interface CliStartFigures {
  nodeMs: number;
  helpMs: number;
  analyzeMs: number;
  npxMs: number;
  npxAnalyzeMs: number;
  fromSourceMs: number;
}

export async function runCliStartBench(rounds = 9): Promise<CliStartFigures> {
  execFileSync(process.execPath, [join(ROOT, 'main/bin/build.mjs'), 'cli'], { cwd: ROOT, stdio: 'ignore' });
  const launch = spawnSync(process.execPath, [BIN, '--help'], {
    cwd: ROOT,
    env: { ...process.env, TUNEBENCH_SHOW_LAUNCH: '1' },
  });
  console.log(`  launcher: ${launch.stderr.toString().trim()}`);
  const dir = await mkdtemp(join(tmpdir(), 'tunebench-cli-bench-'));
  const csv = join(dir, 'sweep-100.csv');
  await writeFile(csv, sweepCsv());
  const node: number[] = [];
  const help: number[] = [];
  const analyze: number[] = [];
  const npx: number[] = [];
  const npxAnalyze: number[] = [];
  const fromSource: number[] = [];
  const loadBefore = loadavg()[0] as number;
  for (let i = 0; i < rounds; i++) {
    node.push(wallMs('node', process.execPath, ['-e', '0']));
    help.push(wallMs('help', process.execPath, [BIN, '--help']));
    analyze.push(wallMs('analyze', process.execPath, [BIN, 'analyze', csv]));
    if (i < 3) npx.push(wallMs('npx', 'npx', ['--no-install', 'tunebench', '--help']));
    if (i < 3) npxAnalyze.push(wallMs('npx-analyze', 'npx', ['--no-install', 'tunebench', 'analyze', csv]));
    if (i < 3)
      fromSource.push(
        wallMs('source', process.execPath, [BIN, '--help'], { ...process.env, TUNEBENCH_FROM_SOURCE: '1' }),
      );
  }
  await rm(dir, { recursive: true, force: true });
  const figures = {
    nodeMs: median(node),
    helpMs: median(help),
    analyzeMs: median(analyze),
    npxMs: median(npx),
    npxAnalyzeMs: median(npxAnalyze),
    fromSourceMs: median(fromSource),
  };
  const ratio = figures.helpMs / figures.nodeMs;
  console.log(
    `  medians of ${rounds} interleaved runs (1-min load average ${loadBefore.toFixed(2)} before, ${(loadavg()[0] as number).toFixed(2)} after, ${cpus().length} cores; wall time grows with load, CPU time much less)`,
  );
  const cpu = (label: string): string => `, CPU ${median(cpuMs.get(label) ?? []).toFixed(0)} ms`;
  console.log(`  node -e 0                          ${figures.nodeMs.toFixed(0)} ms${cpu('node')}`);
  console.log(
    `  tunebench --help (bin, bundle)     ${figures.helpMs.toFixed(0)} ms = ${ratio.toFixed(2)}× node -e 0 (target ≤ 3×) ${ratio <= 3 ? 'meets' : 'MISSES'}${cpu('help')}`,
  );
  console.log(
    `  tunebench analyze 100-point CSV    ${figures.analyzeMs.toFixed(0)} ms (target ≤ 300 ms) ${figures.analyzeMs <= 300 ? 'meets' : 'MISSES'}${cpu('analyze')}`,
  );
  console.log(
    `  npx tunebench --help               ${figures.npxMs.toFixed(0)} ms (median of 3; npm's own start-up included; no target)${cpu('npx')}`,
  );
  console.log(
    `  npx tunebench analyze 100-point CSV ${figures.npxAnalyzeMs.toFixed(0)} ms (median of 3; npm's own start-up included; the 300 ms target is the bin's)${cpu('npx-analyze')}`,
  );
  console.log(
    `  tunebench --help from sources (tsx) ${figures.fromSourceMs.toFixed(0)} ms (median of 3; the checkout fallback, for comparison)${cpu('source')}`,
  );
  return figures;
}
