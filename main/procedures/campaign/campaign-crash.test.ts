/**
 * A campaign killed with SIGKILL in the middle of a soak, then resumed: the
 * runs that had finished stay byte for byte, nothing finished is measured
 * again, and the campaign completes with one run per condition.
 */
import { spawn } from 'node:child_process';
import { createHash } from 'node:crypto';
import { mkdtemp, readdir, readFile, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { afterAll, describe, expect, it } from 'vitest';
import { onStdoutLines } from '../../../test/testing/child-stdout-lines.ts';
import { assembleBench, SIM_CAMPAIGN_BENCH_CONFIG } from '../../bench/assemble.ts';
import { readRunFolder } from '../../store/index.ts';
import { VirtualClock } from '../../time/virtual-clock.ts';
import { RunControl } from '../run-control.ts';
import { readCampaignFile } from './campaign-file.ts';
import { campaignDut } from './demo-campaign.ts';
import { resumeCampaign } from './run-campaign.ts';

const CHILD = fileURLToPath(new URL('./testing/campaign-child.ts', import.meta.url));
const dirs: string[] = [];
afterAll(async () => {
  for (const dir of dirs) await rm(dir, { recursive: true, force: true });
});

async function folderHash(dir: string): Promise<string> {
  const hash = createHash('sha256');
  for (const name of (await readdir(dir)).sort()) {
    if (name === 'writer.lock') continue;
    hash.update(name);
    hash.update(await readFile(join(dir, name)));
  }
  return hash.digest('hex');
}

function runAndKillInSoak(runsDir: string, holdIndex: number): Promise<string[]> {
  return new Promise((resolve, reject) => {
    const child = spawn(process.execPath, ['--import', 'tsx', CHILD, runsDir, String(holdIndex)], {
      stdio: ['ignore', 'pipe', 'pipe'],
    });
    const done: string[] = [];
    let stderr = '';
    child.stderr.on('data', (chunk: Buffer) => (stderr += chunk.toString()));
    onStdoutLines(child, (line) => {
      const [tag, , runId] = line.split(' ');
      if (tag === 'done' && runId) done.push(runId);
      if (tag === 'soaking') child.kill('SIGKILL');
    });
    child.on('error', reject);
    child.on('exit', (_code, signal) =>
      signal === 'SIGKILL' ? resolve(done) : reject(new Error(`child ended without SIGKILL: ${stderr}`)),
    );
  });
}

describe('campaign killed during a soak', () => {
  it(
    'resumes: earlier runs intact, nothing finished measured twice, every condition done once',
    { timeout: 120_000 },
    async () => {
      const runsDir = await mkdtemp(join(tmpdir(), 'tunebench-campaigncrash-'));
      dirs.push(runsDir);
      // Condition 3 is the first at 25 °C: three runs at −10 °C are finished when its soak is under way.
      const finished = await runAndKillInSoak(runsDir, 3);
      expect(finished).toHaveLength(3);
      const [campaignId] = await readdir(runsDir);
      const dir = join(runsDir, campaignId as string);
      const killed = await readCampaignFile(dir);
      expect(killed.status).toBe('running');
      expect(killed.conditions[3]?.state).toBe('soaking');
      const before = new Map<string, string>();
      for (const runId of finished) before.set(runId, await folderHash(join(dir, runId)));

      const clock = new VirtualClock({ autoAdvance: true, startWallIso: '2026-04-02T06:00:00.000Z' });
      const bench = await assembleBench(SIM_CAMPAIGN_BENCH_CONFIG, { clock, sim: { dut: campaignDut(), seed: 22 } });
      try {
        const outcome = await resumeCampaign({ bench, clock, control: new RunControl(), dir });
        expect(outcome.file.status).toBe('complete');
        expect(outcome.file.conditions.every((c) => c.state === 'done')).toBe(true);
        expect(outcome.file.conditions.slice(0, 3).map((c) => c.runId)).toEqual(finished);
        for (const [runId, hash] of before) expect(await folderHash(join(dir, runId)), runId).toBe(hash);
        // One run folder per condition: no finished condition was swept again, and the soak left no run behind.
        const runFolders = (await readdir(dir, { withFileTypes: true }))
          .filter((e) => e.isDirectory())
          .map((e) => e.name);
        expect(runFolders.sort()).toEqual(outcome.file.conditions.map((c) => c.runId as string).sort());
        for (const runId of runFolders) expect((await readRunFolder(join(dir, runId))).meta.status).toBe('complete');
        expect(outcome.file.conditions[3]?.message).toMatch(/was soaking/);
        expect(bench.sim?.snapshot().supply.map((s) => s.outputOn)).toEqual([false, false]);
      } finally {
        await bench.close();
      }
    },
  );
});
