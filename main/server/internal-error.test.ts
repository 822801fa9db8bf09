/**
 * Issue 10 item 2 (same kind): a server-side failure answers 500 *and* is
 * reported, never swallowed; a missing file stays a plain 404. A symlink loop
 * under the renderer folder gives a real ELOOP from the file system.
 */
import { mkdtemp, mkdir, rm, symlink, writeFile } from 'node:fs/promises';
import { request } from 'node:http';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import type { BenchApi } from '../../app/contract/bench-api.ts';
import { startBrowserServer } from './http-server.ts';

function getStatus(port: number, path: string): Promise<number> {
  return new Promise((resolve, reject) => {
    const req = request({ host: '127.0.0.1', port, path }, (res) => {
      res.resume();
      res.on('end', () => resolve(res.statusCode ?? 0));
    });
    req.on('error', reject);
    req.end();
  });
}

describe('browser server internal errors', () => {
  it('answers 500 to an ELOOP and logs it; a missing file is 404 and not logged', async () => {
    const root = await mkdtemp(join(tmpdir(), 'tunebench-500-'));
    try {
      await mkdir(join(root, 'assets'));
      await writeFile(join(root, 'index.html'), '<!doctype html><title>t</title>');
      await symlink('loop.js', join(root, 'assets', 'loop.js'));
      const logged: string[] = [];
      const server = await startBrowserServer({
        host: '127.0.0.1',
        port: 0,
        rendererDir: root,
        api: {} as BenchApi, // the page routes never touch the API
        token: 't'.repeat(43),
        logError: (message) => logged.push(message),
      });
      try {
        expect(await getStatus(server.port, `/assets/missing.js?token=${server.token}`)).toBe(404);
        expect(logged).toEqual([]);
        expect(await getStatus(server.port, `/assets/loop.js?token=${server.token}`)).toBe(500);
        expect(logged).toHaveLength(1);
        expect(logged[0]).toMatch(/GET \/assets\/loop\.js\?token=.* failed: .*ELOOP/);
      } finally {
        await server.close();
      }
    } finally {
      await rm(root, { recursive: true, force: true });
    }
  });
});
