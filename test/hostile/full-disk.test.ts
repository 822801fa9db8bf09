/**
 * A completely full disk under the runs folder, on a real file system: a
 * 256 KiB tmpfs mounted in a private mount namespace (`unshare -m`, as
 * root or with a user namespace), filled to ENOSPC by a filler file and
 * then given back 32 KiB, so a real `tunebench sweep` runs out of space in
 * the middle of the run (issue 15 item 6, the part left: run.json stayed
 * `running` for ever, read back as interrupted with no reason). The
 * simulated bench runs outside the namespace on TCP; the supply's real state
 * is read from the simulator.
 */
import { spawn, spawnSync } from 'node:child_process';
import { mkdir, mkdtemp, readFile, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { afterEach, describe, expect, it } from 'vitest';
import { hostileBench, type HostileBench } from './hostile-bench.ts';

const LAUNCHER = fileURLToPath(new URL('../../main/bin/tunebench.mjs', import.meta.url));

/** `unshare` arguments that can mount a tmpfs here (root: -m; otherwise a user namespace too), or null. */
function mountNamespace(): string[] | null {
  for (const args of [['-m'], ['-m', '-r']]) {
    const probe = spawnSync('unshare', [...args, 'sh', '-c', 'mount -t tmpfs -o size=64k tmpfs "$0"', tmpdir()], {
      stdio: 'ignore',
    });
    if (probe.status === 0) return args;
  }
  return null;
}
const UNSHARE = process.platform === 'linux' ? mountNamespace() : null;
if (!UNSHARE) console.warn('full-disk test skipped: cannot mount a tmpfs in a private mount namespace (unshare -m)');

/**
 * Inside the namespace: mount the tmpfs on $1, fill it, free $2 KiB, run the command after "--" with its runs
 * folder there, then copy what the run left into $3 (outside) before the namespace and its tmpfs go away.
 */
const SCRIPT = `
set -u
mount -t tmpfs -o size=256k tmpfs "$1" || exit 90
mkdir "$1/runs"
dd if=/dev/zero of="$1/fill" bs=4k 2>/dev/null
truncate -s -$(($2 * 1024)) "$1/fill"
out="$3"; shift 3
"$@"
code=$?
for f in "$out/mnt/runs"/*/run.json; do cp "$f" "$out/run.json"; done
for f in "$out/mnt/runs"/*/samples.csv; do cp "$f" "$out/samples.csv"; done
ls -A "$out/mnt/runs"/*/ > "$out/listing"
exit $code
`;

let bench: HostileBench | null = null;
let outDir = '';
afterEach(async () => {
  await bench?.close();
  bench = null;
  if (outDir) await rm(outDir, { recursive: true, force: true });
  outDir = '';
});

describe.skipIf(!UNSHARE)('a completely full disk (real tmpfs)', () => {
  it('the sweep stops at the write the disk refuses, run.json says failed with the reason, the supply ends safe', async () => {
    const b = await hostileBench();
    bench = b;
    outDir = await mkdtemp(join(tmpdir(), 'tunebench-full-disk-'));
    const mountPoint = join(outDir, 'mnt');
    await mkdir(mountPoint);
    // 201 points × 8 readings ≈ 80 KB of rows: well past the 32 KiB left, so the disk fills mid-run.
    const plan = await b.planFile({
      start: 2,
      stop: 4,
      step: 0.01,
      readingsPerPoint: 8,
      gateS: 0.001,
      settle: { mode: 'fixed', seconds: 0.001 },
      refineEdgeV: 0,
      limits: { maxControlV: 5, currentLimitA: 0.02 },
      safe: { controlV: 0, outputOff: true },
    });
    const child = spawn(
      'unshare',
      [
        ...(UNSHARE ?? []),
        'sh',
        '-c',
        SCRIPT,
        'full-disk',
        mountPoint,
        '32',
        outDir,
        process.execPath,
        LAUNCHER,
        'sweep',
        '--bench',
        b.benchFile,
        '--plan',
        plan,
        '--runs',
        join(mountPoint, 'runs'),
      ],
      { stdio: ['ignore', 'pipe', 'pipe'] },
    );
    let err = '';
    child.stderr.on('data', (chunk: Buffer) => (err += chunk.toString()));
    child.stdout.resume();
    const code = await new Promise<number | null>((resolve) => child.on('close', resolve));
    expect(code, err).toBe(1);
    // The refusal names the file and the OS error.
    expect(err).toMatch(/cannot write \S+samples\.csv: ENOSPC/);
    // run.json records the end and its reason, though the disk had no block left for a new copy of it.
    const meta = JSON.parse(await readFile(join(outDir, 'run.json'), 'utf8')) as Record<string, unknown>;
    expect(meta.status).toBe('failed');
    expect(meta.failure).toMatch(/samples\.csv: ENOSPC/);
    expect(meta.endedAt).toEqual(expect.any(String));
    // Nothing half-written is left: no temp files, and samples.csv holds whole rows only.
    const listing = (await readFile(join(outDir, 'listing'), 'utf8')).split('\n').filter(Boolean);
    expect(listing.filter((name) => name.endsWith('.tmp'))).toEqual([]);
    expect(listing).not.toContain('writer.lock');
    const rows = (await readFile(join(outDir, 'samples.csv'), 'utf8')).split('\n');
    expect(rows.pop()).toBe('');
    const width = rows[0]?.split(',').length ?? 0;
    expect(rows.length).toBeGreaterThan(100);
    expect(rows.length).toBeLessThan(201 * 8);
    for (const row of rows) expect(row.split(',').length).toBe(width);
    // The supply as the simulator holds it: control channel at 0 V, output off.
    expect(b.served.bench.snapshot().supply[0]).toMatchObject({ outputOn: false, setpointV: 0 });
  }, 120_000);
});
