import { spawn } from 'node:child_process';
import { connect } from 'node:net';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { onStdoutLines } from '../../test/testing/child-stdout-lines.ts';
import { watchParent } from './parent-watch.ts';

function alive(pid: number): boolean {
  try {
    process.kill(pid, 0);
    return true;
  } catch {
    return false;
  }
}

describe('watchParent', () => {
  it('calls back once when the parent pid changes, never before', async () => {
    let ppid = 100;
    let calls = 0;
    const dispose = watchParent(() => calls++, { intervalMs: 5, parentPid: () => ppid });
    await new Promise((r) => setTimeout(r, 30));
    expect(calls).toBe(0);
    ppid = 1; // re-parented to init: the starter is gone
    await new Promise((r) => setTimeout(r, 30));
    expect(calls).toBe(1);
    dispose();
  });

  it(
    '`tunebench sim` whose starting process is killed with SIGTERM exits and frees its ports',
    { timeout: 60_000 },
    async () => {
      const bin = join(import.meta.dirname, '..', 'bin', 'tunebench.mjs');
      // The shell stands in for npx: it starts node and is then killed; the signal does not reach node.
      const shell = spawn('/bin/sh', ['-c', `"${process.execPath}" "${bin}" sim --base-port 0 & echo "pid $!"; wait`], {
        stdio: ['ignore', 'pipe', 'ignore'],
      });
      let childPid = 0;
      let supplyPort = 0;
      await new Promise<void>((resolve, reject) => {
        const timer = setTimeout(() => reject(new Error('sim did not start')), 40_000);
        onStdoutLines(shell, (line) => {
          const pid = /^pid (\d+)/.exec(line);
          if (pid) childPid = Number(pid[1]);
          const supply = /supply\s+tcp:\/\/127\.0\.0\.1:(\d+)/.exec(line);
          if (supply) supplyPort = Number(supply[1]);
          if (childPid > 0 && supplyPort > 0) {
            clearTimeout(timer);
            resolve();
          }
        });
      });
      expect(alive(childPid)).toBe(true);
      shell.kill('SIGTERM');
      let waitedMs = 0;
      while (alive(childPid) && waitedMs < 10_000) {
        await new Promise((r) => setTimeout(r, 100));
        waitedMs += 100;
      }
      if (alive(childPid)) process.kill(childPid, 'SIGKILL');
      expect(waitedMs).toBeLessThan(10_000);
      const refused = await new Promise<boolean>((resolve) => {
        const socket = connect(supplyPort, '127.0.0.1');
        socket.once('connect', () => (socket.destroy(), resolve(false)));
        socket.once('error', () => resolve(true));
      });
      expect(refused).toBe(true);
    },
  );
});
